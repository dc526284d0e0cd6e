import { describe, expect, it } from 'vitest';
import type { EnrollmentStatus } from '../api/get-roster';
import { mayMarkLost, mayRecordWithdrawal } from './roster-actions';

const statuses: EnrollmentStatus[] = [
  'invited',
  'screened',
  'excluded',
  'consented',
  'assigned',
  'active',
  'completed',
  'withdrew',
  'lost',
];

// Expected values from the api contract: markLost accepts only assigned/active; withdraw refuses completed and excluded
// and leaves a withdrawn enrollment as it is (api/src/enrollments/enrollments.service.ts).
describe('roster actions', () => {
  it('offers "lost to follow-up" only to assigned and active participants', () => {
    expect(statuses.filter(mayMarkLost)).toEqual(['assigned', 'active']);
  });

  it('offers a withdrawal to everyone still taking part or lost, not to completed, excluded or withdrawn people', () => {
    expect(statuses.filter(mayRecordWithdrawal)).toEqual([
      'invited',
      'screened',
      'consented',
      'assigned',
      'active',
      'lost',
    ]);
  });
});
