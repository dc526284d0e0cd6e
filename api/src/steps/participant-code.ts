import { createHmac, timingSafeEqual } from 'node:crypto';
import { normalizeCompletionCode } from './completion-code';

/** No 0/O, 1/I/L: codes are read off screens and paper. */
const ALPHABET = 'ABCDEFGHJKMNPQRSTUVWXYZ23456789';
const LENGTH = 10;

/**
 * A participant's own completion code for one step, derived with HMAC-SHA-256 from the study's code key, so it
 * needs no storage, differs for every enrollment and step, and works only for the person it was issued to.
 * 10 characters of a 31-letter alphabet: about 49 bits.
 */
export function participantCode(codeKey: Buffer, enrollmentId: string, stepId: string): string {
  const digest = createHmac('sha256', codeKey).update(`participant-code\n${enrollmentId}\n${stepId}`).digest();
  let value = digest.readBigUInt64BE(0);
  let code = '';
  for (let i = 0; i < LENGTH; i++) {
    code += ALPHABET[Number(value % BigInt(ALPHABET.length))];
    value /= BigInt(ALPHABET.length);
  }
  return `${code.slice(0, 5)}-${code.slice(5)}`;
}

/** Compared without case, spaces or the dash, in constant time. */
export function participantCodeMatches(codeKey: Buffer, enrollmentId: string, stepId: string, given: string): boolean {
  const expected = Buffer.from(
    normalizeCompletionCode(participantCode(codeKey, enrollmentId, stepId)).replace(/-/g, ''),
  );
  const typed = Buffer.from(normalizeCompletionCode(given).replace(/-/g, ''));
  return expected.length === typed.length && timingSafeEqual(expected, typed);
}
