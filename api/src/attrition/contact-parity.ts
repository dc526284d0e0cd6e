import { type WelchAnovaResult, welchAnova } from './pay-parity';
import type { Moments } from './sufficient-statistics';

/** Contacts after randomization in one arm: count, sum and sum of squares of contacts per participant, by kind. */
export interface ArmContactMoments {
  conditionId: string;
  total: Moments;
  reminders: number;
  reconsentRequests: number;
  staffMessages: number;
}

export interface ContactParity {
  conditions: Array<{
    conditionId: string;
    participants: number;
    contacts: number;
    meanPerParticipant: number | null;
    reminders: number;
    reconsentRequests: number;
    staffMessages: number;
  }>;
  /** Largest minus smallest arm mean, contacts per participant. */
  largestMeanDifference: number | null;
  test: WelchAnovaResult;
}

/**
 * Mean contacts per randomized participant in each arm, with Welch's ANOVA for equal means (the same test as pay
 * parity, for the same reason: variances differ exactly when follow-up does). A lab uses it to show it reminded
 * and wrote to every condition alike; reminders that differ by arm are themselves a cause of differential attrition.
 */
export function contactParity(arms: readonly ArmContactMoments[]): ContactParity {
  const conditions = arms.map((arm) => ({
    conditionId: arm.conditionId,
    participants: arm.total.n,
    contacts: arm.total.sum,
    meanPerParticipant: arm.total.n > 0 ? arm.total.sum / arm.total.n : null,
    reminders: arm.reminders,
    reconsentRequests: arm.reconsentRequests,
    staffMessages: arm.staffMessages,
  }));
  const means = conditions.map((c) => c.meanPerParticipant).filter((m): m is number => m !== null);
  return {
    conditions,
    largestMeanDifference: means.length >= 2 ? Math.max(...means) - Math.min(...means) : null,
    test: welchAnova(
      arms.map((arm) => ({ conditionId: arm.conditionId, ...arm.total })),
      'contacts',
    ),
  };
}
