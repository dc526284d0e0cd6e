import { describe, expect, it } from 'vitest';
import { isLoopbackOrigin } from './loopback-origin';

describe('isLoopbackOrigin', () => {
  it('lets in the admin and portal dev servers on any loopback port', () => {
    for (const origin of [
      'http://127.0.0.1:5174',
      'http://127.0.0.1:5184',
      'http://localhost:5173',
      'http://[::1]:5174',
      'http://127.8.9.10',
      'https://admin.localhost:8443',
    ]) {
      expect(isLoopbackOrigin(origin), origin).toBe(true);
    }
  });

  it('keeps out other hosts, opaque origins and anything that is not an origin', () => {
    // Look-alikes: RFC 6761 reserves only "localhost" and names ending in ".localhost".
    for (const origin of [
      undefined,
      '',
      'null',
      'https://example.org',
      'http://localhost.example.org',
      'http://127.0.0.1.example.org',
      'http://10.0.0.5:5174',
      'file://',
      'http://127.0.0.1:5174/path',
      'chrome-extension://abc',
    ]) {
      expect(isLoopbackOrigin(origin), String(origin)).toBe(false);
    }
  });
});
