import { describe, expect, it } from 'vitest';
import type { PayoutAccount } from '../api/get-payout-account';
import { setupReturnFrom, setupView } from './setup-view';

const none: PayoutAccount = { exists: false, payoutsEnabled: false, onboarding: 'none' };
const started: PayoutAccount = { exists: true, payoutsEnabled: false, onboarding: 'started' };
const submitted: PayoutAccount = { exists: true, payoutsEnabled: false, onboarding: 'complete' };
const ready: PayoutAccount = { exists: true, payoutsEnabled: true, onboarding: 'complete' };

describe('what the payout setup shows', () => {
  it('follows the account when nobody just came back', () => {
    expect(setupView(none, null, false)).toBe('none');
    expect(setupView(started, null, false)).toBe('started');
    expect(setupView(submitted, null, false)).toBe('being-checked');
    expect(setupView(ready, null, false)).toBe('ready');
  });

  it('keeps checking after a finished setup until payouts are enabled or the checks run out', () => {
    expect(setupView(started, 'done', true)).toBe('checking');
    expect(setupView(ready, 'done', true)).toBe('ready');
    expect(setupView(started, 'done', false)).toBe('started');
    expect(setupView(submitted, 'done', false)).toBe('being-checked');
  });

  it('offers a new link after an expired one, unless payouts already work', () => {
    expect(setupView(started, 'expired', false)).toBe('expired');
    expect(setupView(ready, 'expired', false)).toBe('ready');
  });

  it('reads only the two return states from the address', () => {
    expect(setupReturnFrom(new URLSearchParams('onboarding=done'))).toBe('done');
    expect(setupReturnFrom(new URLSearchParams('onboarding=expired'))).toBe('expired');
    expect(setupReturnFrom(new URLSearchParams('onboarding=<script>'))).toBeNull();
    expect(setupReturnFrom(new URLSearchParams(''))).toBeNull();
  });
});
