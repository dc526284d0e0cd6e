import { describe, expect, it } from 'vitest';
import { hashToken, newOpaqueToken, successorToken } from './session-tokens';

describe('session tokens', () => {
  it('derives the same successor for the same token and key, and a different one otherwise', () => {
    const { token } = newOpaqueToken();
    const next = successorToken('k'.repeat(32), token);
    expect(successorToken('k'.repeat(32), token)).toBe(next);
    expect(successorToken('other-key'.repeat(4), token)).not.toBe(next);
    expect(successorToken('k'.repeat(32), newOpaqueToken().token)).not.toBe(next);
    expect(next).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(hashToken(next)).toMatch(/^[0-9a-f]{64}$/);
  });
});

describe('sign-in link tokens', () => {
  it('are the same for the same job and differ between jobs', async () => {
    const { signInLinkToken } = await import('./session-tokens');
    const key = 'k'.repeat(32);
    expect(signInLinkToken(key, 'job-1')).toBe(signInLinkToken(key, 'job-1'));
    expect(signInLinkToken(key, 'job-1')).not.toBe(signInLinkToken(key, 'job-2'));
    expect(signInLinkToken(key, 'job-1')).not.toBe(successorToken(key, 'job-1'));
  });
});
