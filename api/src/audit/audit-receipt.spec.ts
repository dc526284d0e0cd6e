import { describe, expect, it } from 'vitest';
import { canonicalJson, hmacHex } from './audit-hash';
import { checkReceipt, RECEIPT_FORMAT, sealReceipt } from './audit-receipt';
import { parseKeyFile, parseKeyList } from './audit-keys';

const KEY = Buffer.alloc(32, 1);
const keyOf = (id: string) => (id === 'k1' ? KEY : undefined);
const body = {
  id: '00000000-0000-4000-8000-000000000001',
  number: 1,
  issuedAt: '2026-12-01T10:00:00.000Z',
  reason: 'scheduled' as const,
  previous: null,
  chains: [
    { chain: 'lab', sequence: 3, hash: 'b'.repeat(64), at: '2026-12-01T09:00:00.000Z' },
    { chain: 'a-study', sequence: 9, hash: 'a'.repeat(64), at: '2026-12-01T09:30:00.000Z' },
  ],
  keyId: 'k1',
};

describe('audit receipts', () => {
  it('seals the canonical JSON of every other field with HMAC-SHA-256, chains in name order', () => {
    const receipt = sealReceipt(KEY, body);
    expect(receipt.format).toBe(RECEIPT_FORMAT);
    expect(receipt.chains.map((c) => c.chain)).toEqual(['a-study', 'lab']);
    const { mac, ...rest } = receipt;
    expect(mac).toBe(hmacHex(KEY, canonicalJson(rest)));
    expect(checkReceipt(JSON.parse(JSON.stringify(receipt)), keyOf)).toBeNull();
  });

  it('names what is wrong with an altered, foreign or malformed receipt', () => {
    const receipt = sealReceipt(KEY, body);
    expect(
      checkReceipt({ ...receipt, chains: [{ ...receipt.chains[0], sequence: 8 }, receipt.chains[1]] }, keyOf),
    ).toBe('receipt-mac-mismatch');
    expect(checkReceipt({ ...receipt, keyId: 'k2' }, keyOf)).toBe('receipt-unknown-key');
    expect(checkReceipt({ format: 'other' }, keyOf)).toBe('receipt-malformed');
    expect(checkReceipt(null, keyOf)).toBe('receipt-malformed');
    expect(checkReceipt({ ...receipt, mac: 'zz' }, keyOf)).toBe('receipt-malformed');
  });
});

describe('audit keys', () => {
  it('reads a key list whose last key is current', () => {
    const ring = parseKeyList(`old=${'11'.repeat(32)}, new=${'22'.repeat(32)}`);
    expect(ring.currentId).toBe('new');
    expect([...ring.keys.keys()]).toEqual(['old', 'new']);
  });

  it('refuses short keys and a current key that is missing, naming the source', () => {
    expect(() => parseKeyList(`k=${'11'.repeat(8)}`)).toThrow(/AUDIT_KEYS: key "k" must be at least 32 bytes/);
    expect(() => parseKeyFile(JSON.stringify({ current: 'x', keys: { y: '11'.repeat(32) } }), '/keys.json')).toThrow(
      /current key "x"/,
    );
  });
});
