import { describe, expect, it } from 'vitest';
import { refusedDetailChanges, type StudyDetails } from './study-edit-rules';

const recruiting: StudyDetails = {
  status: 'recruiting',
  archived: false,
  design: 'between',
  protocolNumber: 'HLCL-2026-014',
  currency: 'USD',
  blinded: true,
  budgetMinor: 100_000,
  targetSize: 60,
};

describe('refusedDetailChanges', () => {
  it('allows every detail before anyone is assigned, except the design after opening', () => {
    expect(
      refusedDetailChanges(
        recruiting,
        { protocolNumber: 'X', currency: 'EUR', blinded: false, budgetMinor: 1, targetSize: 1 },
        0,
      ),
    ).toEqual([]);
    expect(refusedDetailChanges(recruiting, { design: 'within' }, 0).map((r) => r.field)).toEqual(['design']);
    expect(refusedDetailChanges({ ...recruiting, status: 'draft' }, { design: 'within' }, 0)).toEqual([]);
  });

  it('after the first assignment fixes protocol, currency and blinding, refuses a lower budget and a target below those assigned', () => {
    const refused = refusedDetailChanges(
      recruiting,
      { protocolNumber: 'X', currency: 'EUR', blinded: false, budgetMinor: 99_999, targetSize: 11 },
      12,
    );
    expect(refused.map((r) => r.field)).toEqual(['protocolNumber', 'currency', 'blinded', 'budgetMinor', 'targetSize']);
    expect(refused.at(-1)!.message).toContain('12 people');
  });

  it('after the first assignment accepts the same values, a higher budget and a target at the number assigned', () => {
    expect(
      refusedDetailChanges(
        recruiting,
        { protocolNumber: 'HLCL-2026-014', currency: 'USD', blinded: true, budgetMinor: 100_001, targetSize: 12 },
        12,
      ),
    ).toEqual([]);
  });
});
