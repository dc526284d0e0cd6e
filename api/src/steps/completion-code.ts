import { createHash } from 'node:crypto';

/** Codes are compared without case or spaces, as people copy them from a screen. */
export function normalizeCompletionCode(code: string): string {
  return code.replace(/\s+/g, '').toUpperCase();
}

/** SHA-256 over the step id and the normalized code, so the same code on two steps hashes differently. */
export function completionCodeHash(stepId: string, code: string): string {
  return createHash('sha256')
    .update(`${stepId}:${normalizeCompletionCode(code)}`)
    .digest('hex');
}
