import { describe, expect, it } from 'vitest';
import { isWebAddress } from './external-page';

describe('addresses the portal may leave for', () => {
  // Schemes per the WHATWG URL Standard's URL parser (url.spec.whatwg.org): only the two web schemes are followed.
  it.each([
    ['http://127.0.0.1:3200/onboarding/acctlink_1', true],
    ['https://payments.example.test/setup?x=1', true],
    ['javascript:alert(1)', false],
    ['data:text/html,<p>hi</p>', false],
    ['/payouts?onboarding=done', false],
    ['', false],
  ])('%s → %s', (address, allowed) => {
    expect(isWebAddress(address)).toBe(allowed);
  });
});
