/**
 * The audit receipt: Evenhand's own JSON record of every chain's head (sequence, hash, time) at one moment, with an
 * HMAC-SHA-256 over its canonical JSON under the audit key. A copy leaves the database (e-mailed to auditors,
 * downloadable), so events deleted or rewritten after it show when the chain is checked against it.
 */
import { timingSafeEqual } from 'node:crypto';
import { canonicalJson, hmacHex } from './audit-hash';

export const RECEIPT_FORMAT = 'evenhand-audit-receipt/1' as const;

export interface ChainHead {
  chain: string;
  sequence: number;
  hash: string;
  at: string;
}

export interface AuditReceiptDocument {
  format: typeof RECEIPT_FORMAT;
  id: string;
  number: number;
  issuedAt: string;
  reason: 'scheduled' | 'on-demand';
  /** The receipt before this one, so a removed receipt leaves a gap in the numbers and the links. */
  previous: { id: string; mac: string } | null;
  chains: ChainHead[];
  keyId: string;
  mac: string;
}

export function receiptMac(key: Buffer, receipt: Omit<AuditReceiptDocument, 'mac'>): string {
  const { mac: _mac, ...body } = receipt as AuditReceiptDocument;
  return hmacHex(key, canonicalJson(body));
}

export function sealReceipt(key: Buffer, body: Omit<AuditReceiptDocument, 'mac' | 'format'>): AuditReceiptDocument {
  const unsealed = {
    format: RECEIPT_FORMAT,
    ...body,
    chains: [...body.chains].sort((a, b) => (a.chain < b.chain ? -1 : a.chain > b.chain ? 1 : 0)),
  };
  return { ...unsealed, mac: receiptMac(key, unsealed) };
}

export type ReceiptProblem = 'receipt-malformed' | 'receipt-unknown-key' | 'receipt-mac-mismatch';

/** Checks a receipt's shape and MAC; returns null when it is genuine. Never throws on bad input. */
export function checkReceipt(candidate: unknown, keyOf: (keyId: string) => Buffer | undefined): ReceiptProblem | null {
  if (!isReceiptShape(candidate)) return 'receipt-malformed';
  const key = keyOf(candidate.keyId);
  if (!key) return 'receipt-unknown-key';
  const expected = Buffer.from(receiptMac(key, candidate), 'hex');
  const given = Buffer.from(candidate.mac, 'hex');
  return given.length === expected.length && timingSafeEqual(given, expected) ? null : 'receipt-mac-mismatch';
}

function isReceiptShape(value: unknown): value is AuditReceiptDocument {
  const r = value as AuditReceiptDocument;
  return (
    typeof r === 'object' &&
    r !== null &&
    r.format === RECEIPT_FORMAT &&
    typeof r.id === 'string' &&
    typeof r.keyId === 'string' &&
    typeof r.mac === 'string' &&
    /^[0-9a-f]{64}$/.test(r.mac) &&
    typeof r.issuedAt === 'string' &&
    Array.isArray(r.chains) &&
    r.chains.every(
      (c) =>
        typeof c === 'object' &&
        c !== null &&
        typeof c.chain === 'string' &&
        Number.isSafeInteger(c.sequence) &&
        c.sequence >= 1 &&
        typeof c.hash === 'string',
    )
  );
}

export const RECEIPT_PROBLEM_TEXT: Record<ReceiptProblem, string> = {
  'receipt-malformed':
    'The receipt is not an Evenhand audit receipt (format, fields or chain heads are missing or malformed).',
  'receipt-unknown-key': 'The receipt names an audit key this server does not hold, so it cannot be checked.',
  'receipt-mac-mismatch':
    'The receipt’s HMAC does not match its contents: the receipt was altered or made without the audit key.',
};
