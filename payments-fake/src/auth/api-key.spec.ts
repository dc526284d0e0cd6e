import { describe, expect, it } from 'vitest';
import { ProviderError } from '../errors/provider-error';
import { maskApiKey, readApiKey, requireTestSecretKey } from './api-key';

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

describe('requireTestSecretKey', () => {
  it('accepts any sk_test_ key', () => {
    expect(requireTestSecretKey('Bearer sk_test_anything')).toBe('sk_test_anything');
  });

  it('refuses a missing key, a live key, a publishable key and a bare prefix with 401', () => {
    for (const header of [undefined, 'Bearer sk_live_abcdefgh1234', 'Bearer pk_test_abcdefgh1234', 'Bearer sk_test_']) {
      try {
        requireTestSecretKey(header);
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
      requireTestSecretKey('Bearer sk_live_secretsecret9876');
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
