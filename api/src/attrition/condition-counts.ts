import { AttritionInputError, proportion, requireAtMost, requireCount } from './attrition-input-error';

/** Status counts of one condition as the database aggregates them; every randomized participant is in exactly one status. */
export interface ConditionStatusCounts {
  conditionId: string;
  randomized: number;
  active: number;
  completed: number;
  withdrew: number;
  lost: number;
  excludedAfterRandomization: number;
  /** Participants whose participation window has ended (everyone once the study is closed), and the completers among them. */
  windowEnded: { randomized: number; completed: number };
}

/** One condition's counts with both dropout measures; rates are null when nobody is in the denominator. */
export interface ConditionAttrition extends ConditionStatusCounts {
  dropped: number;
  /** dropped / randomized, counting active participants as not (yet) dropped. */
  dropoutRateSoFar: number | null;
  /** The WWC quantity: (randomized − completed) / randomized over participants whose window has ended. */
  attritionRate: number | null;
  /** windowEnded.randomized − windowEnded.completed: the numerator of attritionRate. */
  attrited: number;
}

export function summarizeCondition(counts: ConditionStatusCounts, field = 'condition'): ConditionAttrition {
  const at = (name: string) => `${field}.${name}`;
  if (typeof counts.conditionId !== 'string' || counts.conditionId === '') {
    throw new AttritionInputError(at('conditionId'), 'must be a non-empty string');
  }
  for (const name of ['randomized', 'active', 'completed', 'withdrew', 'lost', 'excludedAfterRandomization'] as const) {
    requireCount(counts[name], at(name));
  }
  requireCount(counts.windowEnded.randomized, at('windowEnded.randomized'));
  requireCount(counts.windowEnded.completed, at('windowEnded.completed'));

  // CONSORT 2010 flow: withdrawn, lost to follow-up and excluded after randomization all leave the analysed group.
  const dropped = counts.withdrew + counts.lost + counts.excludedAfterRandomization;
  const accounted = counts.active + counts.completed + dropped;
  if (accounted !== counts.randomized) {
    throw new AttritionInputError(
      at('randomized'),
      `must equal active + completed + withdrew + lost + excludedAfterRandomization (${accounted}), got ${counts.randomized}`,
    );
  }
  requireAtMost(counts.windowEnded.randomized, counts.randomized, at('windowEnded.randomized'), 'randomized');
  requireAtMost(counts.windowEnded.completed, counts.windowEnded.randomized, at('windowEnded.completed'), 'windowEnded.randomized');
  requireAtMost(counts.windowEnded.completed, counts.completed, at('windowEnded.completed'), 'completed');

  const attrited = counts.windowEnded.randomized - counts.windowEnded.completed;
  return {
    ...counts,
    windowEnded: { ...counts.windowEnded },
    dropped,
    dropoutRateSoFar: proportion(dropped, counts.randomized),
    // WWC Procedures and Standards Handbook v4.1: attrition = share of the randomized sample not in the analytic sample.
    attritionRate: proportion(attrited, counts.windowEnded.randomized),
    attrited,
  };
}
