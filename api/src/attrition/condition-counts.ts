import { AttritionInputError, proportion, requireAtMost, requireCount } from './attrition-input-error';
import { type Interval, wilsonInterval } from './intervals';

/**
 * How people still active are counted, the same way in every panel (WWC rates, the dropout test, the curves, the
 * flow diagram) and in the export.
 */
export const COUNTING_RULE =
  'While the study runs, people still active are not (yet) dropped out: they are left out of WWC attrition until their window ends, count as not dropped in the dropout test and are censored in the curves. Once the study is closed, anyone still active did not complete: they count as dropped out at the closing time in every panel, in the flow diagram ("did not complete by the close") and in the export.';

/** Status counts of one condition as the database aggregates them; every randomized participant is in exactly one status. */
export interface ConditionStatusCounts {
  conditionId: string;
  randomized: number;
  active: number;
  completed: number;
  withdrew: number;
  lost: number;
  excludedAfterRandomization: number;
  /** Still active when the study closed: did not complete, so counted as dropped out (see COUNTING_RULE). */
  incompleteAtClose?: number;
  /** Participants whose participation window has ended (everyone once the study is closed), and the completers among them. */
  windowEnded: { randomized: number; completed: number };
}

/** One condition's counts with both dropout measures; rates are null when nobody is in the denominator. */
export interface ConditionAttrition extends ConditionStatusCounts {
  incompleteAtClose: number;
  /** withdrew + lost + excluded after randomization + still active when the study closed. */
  dropped: number;
  /** dropped / randomized, counting active participants as not (yet) dropped. */
  dropoutRateSoFar: number | null;
  /** The WWC quantity: (randomized − completed) / randomized over participants whose window has ended. */
  attritionRate: number | null;
  /** windowEnded.randomized − windowEnded.completed: the numerator of attritionRate. */
  attrited: number;
  /** 95 % Wilson interval for attritionRate; null when nobody's window has ended. */
  attritionInterval: Interval | null;
}

export function summarizeCondition(counts: ConditionStatusCounts, field = 'condition'): ConditionAttrition {
  const at = (name: string) => `${field}.${name}`;
  if (typeof counts.conditionId !== 'string' || counts.conditionId === '') {
    throw new AttritionInputError(at('conditionId'), 'must be a non-empty string');
  }
  for (const name of ['randomized', 'active', 'completed', 'withdrew', 'lost', 'excludedAfterRandomization'] as const) {
    requireCount(counts[name], at(name));
  }
  const incompleteAtClose = requireCount(counts.incompleteAtClose ?? 0, at('incompleteAtClose'));
  requireCount(counts.windowEnded.randomized, at('windowEnded.randomized'));
  requireCount(counts.windowEnded.completed, at('windowEnded.completed'));

  // CONSORT 2010 flow: withdrawn, lost to follow-up and excluded after randomization all leave the analysed group, and
  // so does anyone still active when the study closed (COUNTING_RULE).
  const dropped = counts.withdrew + counts.lost + counts.excludedAfterRandomization + incompleteAtClose;
  const accounted = counts.active + counts.completed + dropped;
  if (accounted !== counts.randomized) {
    throw new AttritionInputError(
      at('randomized'),
      `must equal active + completed + withdrew + lost + excludedAfterRandomization + incompleteAtClose (${accounted}), got ${counts.randomized}`,
    );
  }
  requireAtMost(counts.windowEnded.randomized, counts.randomized, at('windowEnded.randomized'), 'randomized');
  requireAtMost(
    counts.windowEnded.completed,
    counts.windowEnded.randomized,
    at('windowEnded.completed'),
    'windowEnded.randomized',
  );
  requireAtMost(counts.windowEnded.completed, counts.completed, at('windowEnded.completed'), 'completed');

  const attrited = counts.windowEnded.randomized - counts.windowEnded.completed;
  return {
    ...counts,
    incompleteAtClose,
    windowEnded: { ...counts.windowEnded },
    dropped,
    dropoutRateSoFar: proportion(dropped, counts.randomized),
    // WWC Procedures and Standards Handbook v4.1: attrition = share of the randomized sample not in the analytic sample.
    attritionRate: proportion(attrited, counts.windowEnded.randomized),
    attrited,
    attritionInterval: wilsonInterval(attrited, counts.windowEnded.randomized, 0.95, field),
  };
}
