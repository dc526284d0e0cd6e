import { describe, expect, it } from 'vitest';
import { readableAction } from './readable-action';

describe('readableAction', () => {
  it('names the events of the enrollment flow in plain words', () => {
    expect(readableAction('consent.signed')).toBe('Signed the consent form');
    expect(readableAction('enrollment.lost')).toBe('Marked lost to follow-up');
  });

  it('turns an unknown dotted code into a phrase', () => {
    expect(readableAction('step.completed')).toBe('Step completed');
    expect(readableAction('payout.approved-by-staff')).toBe('Payout approved by staff');
  });
});
