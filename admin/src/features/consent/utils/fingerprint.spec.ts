import { describe, expect, it } from 'vitest';
import { shortFingerprint } from './fingerprint';

// Same shortening as the study header's sequence fingerprint (features/studies/components/study-header.tsx).
describe('shortFingerprint', () => {
  it('keeps the first 8 and last 5 hex digits of a SHA-256 and leaves short values whole', () => {
    expect(shortFingerprint('e5b32837e18bc7456919aac1f4c156c4ce23110ee631096b85d4f44fb295094a')).toBe('e5b32837…5094a');
    expect(shortFingerprint('abc123')).toBe('abc123');
  });
});
