import { describe, expect, it } from 'vitest';
import { undoUnavailableReason } from './step-wording';

const completion = {
  id: 'c1',
  completedAt: '2027-01-05T10:00:00.000Z',
  verifiedBy: 'staff' as const,
  recordedByEmail: 'coordinator@evenhand.test',
  evidence: {},
  payoutStatus: 'owed' as const,
  canUndo: true,
};

describe('undoUnavailableReason', () => {
  it('offers undo while the pay is not approved', () => {
    expect(undoUnavailableReason(completion)).toBeNull();
  });

  it('explains that approved pay cannot be taken back', () => {
    expect(undoUnavailableReason({ ...completion, payoutStatus: 'approved', canUndo: false })).toMatch(
      /pay has been approved/,
    );
  });
});
