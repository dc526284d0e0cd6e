import type { StudyDesign } from '../studies';
import { RandomizationError, RandomizationErrorCode } from './randomization-error';
import {
  DEFAULT_COIN_PROBABILITY,
  DEFAULT_IMBALANCE_MEASURE,
  SchemeMethod,
  SchemeParameters,
  StratificationFactor,
  validateSchemeParameters,
} from './scheme-parameters';

/** What the studies domain tells the assignment engine about a study's design. */
export interface StudyDesignSnapshot {
  design: StudyDesign;
  /** In the order the researcher listed them (the first row of a within-subjects design). */
  conditions: Array<{ id: string; weight: number }>;
  factors: Array<{
    key: string;
    kind: 'numeric' | 'categorical';
    cutPoints: number[] | null;
    categories: string[] | null;
    minimizationWeight: number;
  }>;
}

/** The researcher's choices for a scheme; conditions and factors come from the study's design. */
export interface SchemeSettings {
  blockSizes?: number[];
  measure?: 'range' | 'variance';
  coinProbability?: number;
  pretestKey?: string;
  squaresPerBlock?: number[];
  /** Within-subjects: hand out orders per stratum of the study's factors. */
  stratify?: boolean;
}

const BETWEEN_METHODS: SchemeMethod[] = [
  'simple',
  'permuted-blocks',
  'stratified-blocks',
  'minimization',
  'matched-pairs',
];

function asFactor(factor: StudyDesignSnapshot['factors'][number]): StratificationFactor {
  return factor.kind === 'numeric'
    ? { id: factor.key, kind: 'numeric', cutPoints: factor.cutPoints ?? [] }
    : { id: factor.key, kind: 'categorical', categories: factor.categories ?? [] };
}

/**
 * Combines the study's design with the researcher's settings into the scheme's full canonical parameters,
 * validated by the engine. Field errors name the setting at fault.
 */
export function buildSchemeParameters(
  method: SchemeMethod,
  settings: SchemeSettings,
  snapshot: StudyDesignSnapshot,
): SchemeParameters {
  const isWithinMethod = !BETWEEN_METHODS.includes(method);
  if (snapshot.design === 'within' && !isWithinMethod) {
    throw new RandomizationError(RandomizationErrorCode.InvalidParameters, [
      {
        field: 'method',
        message: `a within-subjects study hands out orders: use counterbalanced, latin-square or williams (got ${method})`,
      },
    ]);
  }
  if (snapshot.design === 'between' && isWithinMethod) {
    throw new RandomizationError(RandomizationErrorCode.InvalidParameters, [
      { field: 'method', message: `${method} orders conditions within each person; this study is between-subjects` },
    ]);
  }
  const conditions = snapshot.conditions.map((c) => ({ conditionId: c.id, weight: c.weight }));
  const factors = snapshot.factors.map(asFactor);
  const candidate: Record<string, unknown> = { method };
  switch (method) {
    case 'simple':
      candidate.conditions = conditions;
      break;
    case 'permuted-blocks':
      Object.assign(candidate, { conditions, blockSizes: settings.blockSizes });
      break;
    case 'stratified-blocks':
      Object.assign(candidate, { conditions, blockSizes: settings.blockSizes, factors });
      break;
    case 'minimization':
      Object.assign(candidate, {
        conditions,
        factors: snapshot.factors.map((f) => ({ ...asFactor(f), weight: f.minimizationWeight })),
        measure: settings.measure ?? DEFAULT_IMBALANCE_MEASURE,
        coinProbability: settings.coinProbability ?? DEFAULT_COIN_PROBABILITY,
      });
      break;
    case 'matched-pairs':
      Object.assign(candidate, { conditions, pretestId: settings.pretestKey });
      break;
    default:
      Object.assign(candidate, {
        conditionIds: snapshot.conditions.map((c) => c.id),
        squaresPerBlock: settings.squaresPerBlock ?? [1],
        factors: settings.stratify ? factors : [],
      });
  }
  const result = validateSchemeParameters(candidate);
  if (!result.ok) throw new RandomizationError(RandomizationErrorCode.InvalidParameters, result.errors);
  return result.value;
}
