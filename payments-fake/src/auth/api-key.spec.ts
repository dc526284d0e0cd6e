import { describe, expect, it } from 'vitest';
import { ProviderError } from '../errors/provider-error';
import { apiKeyFingerprint, maskApiKey, readApiKey, requireTestKey } from './api-key';

// https://docs.stripe.com/api/authentication: Bearer token, or the key as the Basic auth user name.
describe('readApiKey', () => {
  it('reads a Bearer token', () => {
    expect(readApiKey('Bearer sk_test_abc123')).toBe('sk_test_abc123');
  });

  it('reads the user name of Basic auth (curl -u sk_test_…:)', () => {
    // Outside reference: RFC 7617 — credentials are base64("user:password").
    const header = `Basic ${Buffer.from('sk_test_basic999:').toString('base64')}`;
    expect(header).toBe('Basic c2tfdGVzdF9iYXNpYzk5OTo=');
    expect(readApiKey(header)).toBe('sk_test_basic999');
  });

  it('gives undefined when there is no usable header', () => {
    expect(readApiKey(undefined)).toBeUndefined();
    expect(readApiKey('Token abc')).toBeUndefined();
  });
});

describe('requireTestKey', () => {
  it('accepts any sk_test_ key as a secret key', () => {
    expect(requireTestKey('Bearer sk_test_anything')).toEqual({ value: 'sk_test_anything', kind: 'secret' });
  });

  it('accepts any pk_test_ key as a publishable key', () => {
    // https://docs.stripe.com/keys: publishable keys start pk_, test-mode keys carry _test_.
    expect(requireTestKey('Bearer pk_test_browser42')).toEqual({ value: 'pk_test_browser42', kind: 'publishable' });
  });

  it('refuses a missing key, live keys, restricted keys and bare prefixes with 401', () => {
    const headers = [
      undefined,
      'Bearer sk_live_abcdefgh1234',
      'Bearer pk_live_abcdefgh1234',
      'Bearer rk_test_abcdefgh1234',
      'Bearer sk_test_',
      'Bearer pk_test_',
    ];
    for (const header of headers) {
      try {
        requireTestKey(header);
        throw new Error(`accepted ${header}`);
      } catch (error) {
        expect(error).toBeInstanceOf(ProviderError);
        expect((error as ProviderError).status).toBe(401);
        expect((error as ProviderError).body.type).toBe('invalid_request_error');
      }
    }
  });

  it('never repeats the whole key in the message', () => {
    try {
      requireTestKey('Bearer sk_live_secretsecret9876');
      throw new Error('accepted a live key');
    } catch (error) {
      expect((error as ProviderError).message).not.toContain('secretsecret');
      expect((error as ProviderError).message).toContain('9876');
    }
  });
});

describe('maskApiKey', () => {
  it('keeps the prefix and the last four characters', () => {
    expect(maskApiKey('sk_test_abcdefghij1234')).toBe('sk_test_**********1234');
    expect(maskApiKey('short')).toBe('sho**');
  });
});

describe('apiKeyFingerprint', () => {
  it('is the first 32 hex digits of the SHA-256 of the key, so the key itself is never kept', () => {
    // SHA-256("abc") = ba7816bf 8f01cfea 414140de 5dae2223 b00361a3 ..., FIPS 180-2 Appendix B.1.
    expect(apiKeyFingerprint('abc')).toBe('ba7816bf8f01cfea414140de5dae2223');
    expect(apiKeyFingerprint('sk_test_evenhand_a')).not.toBe(apiKeyFingerprint('sk_test_evenhand_b'));
    expect(apiKeyFingerprint('sk_test_evenhand_a')).not.toContain('sk_test');
  });
});
