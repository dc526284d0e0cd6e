/**
 * Dry run: simulate N arrivals with a throwaway seed and a covariate mix, run the configured scheme through
 * the same code the verifier replays (deriveSequence), and report balance per condition (or order), per
 * stratum and per factor level, plus the largest imbalance over time.
 *
 * Imbalance of a set of counts: the largest minus the smallest of count ÷ relative weight (weights divided
 * by the smallest weight), so with equal weights it is the largest difference in counts between two
 * conditions, and a 2:1 design at 10 and 5 counts as balanced. Within-subjects designs compare orders.
 */
import { FieldError, RandomizationError, RandomizationErrorCode } from './randomization-error';
import { deriveSequence, RecordedArrival, schemeFactors } from './derive-sequence';
import {
  isWithinDesign,
  parseSchemeParameters,
  SchemeParameters,
  StratificationFactor,
  validateSchemeParameters,
} from './scheme-parameters';
import { createSeededStream, normalizeSeed, SeededStream, streamLabel } from './seeded-stream';
import { allStratumKeys, Covariates, factorLevels, participantLevels } from './strata';
import { ordersOf } from './within/order-sequence';

/** How one covariate is distributed among simulated arrivals. Proportions and probabilities are relative. */
export type CovariateDistribution =
  | { kind: 'categorical'; proportions: Record<string, number> }
  | { kind: 'numeric-values'; values: { value: number; probability: number }[] }
  | { kind: 'normal'; mean: number; sd: number };

export interface DryRunInput {
  parameters: SchemeParameters;
  /** Number of simulated arrivals, 1 to MAX_DRY_RUN_ARRIVALS. */
  arrivals: number;
  /** A throwaway seed (generateSeed()); never the study's sealed seed. */
  seed: string;
  /** One distribution per covariate the scheme uses, keyed by covariate id. */
  covariateMix: Record<string, CovariateDistribution>;
  /** Extra factors to report balance on, e.g. a pretest band under simple randomization. */
  reportFactors?: StratificationFactor[];
}

export interface ArmBalance {
  /** The condition id, or "order-1", "order-2", … for within-subjects designs. */
  armId: string;
  /** The condition id, or the order as "A → B → C". */
  label: string;
  count: number;
  share: number;
  targetShare: number;
}

export interface StratumBalance {
  stratumKey: string;
  total: number;
  counts: Record<string, number>;
  imbalance: number;
}

export interface FactorLevelBalance {
  factorId: string;
  level: string;
  total: number;
  counts: Record<string, number>;
  imbalance: number;
}

/** The largest imbalance reached within one sampled stretch of arrivals, ending at `arrivals`. */
export interface ImbalancePoint {
  arrivals: number;
  overall: number;
  largestInStratum: number;
  largestInFactorLevel: number;
}

export interface DryRunResult {
  arrivals: number;
  arms: ArmBalance[];
  strata: StratumBalance[];
  factorLevels: FactorLevelBalance[];
  imbalanceOverTime: ImbalancePoint[];
  largestImbalance: { overall: number; inStratum: number; inFactorLevel: number };
  finalImbalance: { overall: number; inStratum: number; inFactorLevel: number };
  matchedPairs: { pairs: number; leftoverParticipantId: string | null } | null;
}

export const MAX_DRY_RUN_ARRIVALS = 100_000;
export const MAX_SERIES_POINTS = 200;

interface CovariateNeed {
  id: string;
  kind: 'numeric' | 'categorical';
  categories: string[];
  reason: string;
}

function covariateNeeds(parameters: SchemeParameters, reportFactors: StratificationFactor[]): CovariateNeed[] {
  const needs = new Map<string, CovariateNeed>();
  const add = (factor: StratificationFactor, reason: string) =>
    needs.set(factor.id, {
      id: factor.id,
      kind: factor.kind,
      categories: factor.kind === 'categorical' ? factor.categories : [],
      reason,
    });
  for (const factor of schemeFactors(parameters)) add(factor, 'the scheme uses it');
  for (const factor of reportFactors) if (!needs.has(factor.id)) add(factor, 'it is a reported factor');
  if (parameters.method === 'matched-pairs') {
    needs.set(parameters.pretestId, {
      id: parameters.pretestId,
      kind: 'numeric',
      categories: [],
      reason: 'pairs are matched on it',
    });
  }
  return [...needs.values()].sort((a, b) => (a.id < b.id ? -1 : 1));
}

type Sampler = (stream: SeededStream) => number | string;

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function validWeight(w: unknown): w is number {
  return typeof w === 'number' && Number.isFinite(w) && w >= 0;
}

function samplerFor(need: CovariateNeed, raw: unknown, errors: FieldError[]): Sampler | undefined {
  const field = `covariateMix.${need.id}`;
  if (!isRecord(raw)) {
    errors.push({ field, message: `needs a distribution because ${need.reason}` });
    return undefined;
  }
  const before = errors.length;
  if (need.kind === 'categorical') {
    if (raw.kind !== 'categorical' || !isRecord(raw.proportions)) {
      errors.push({
        field,
        message: 'must be {kind: "categorical", proportions: {category: share}} for a categorical factor',
      });
      return undefined;
    }
    const proportions = raw.proportions;
    for (const [category, share] of Object.entries(proportions)) {
      if (!need.categories.includes(category)) {
        errors.push({
          field: `${field}.proportions.${category}`,
          message: `is not a category of "${need.id}" (${need.categories.join(', ')})`,
        });
      } else if (!validWeight(share)) {
        errors.push({ field: `${field}.proportions.${category}`, message: 'must be a share of 0 or more' });
      }
    }
    const weights = need.categories.map((c) => (validWeight(proportions[c]) ? (proportions[c] as number) : 0));
    if (errors.length === before && !weights.some((w) => w > 0)) {
      errors.push({ field: `${field}.proportions`, message: 'must give at least one category a share above 0' });
    }
    return errors.length === before ? (stream) => need.categories[stream.weightedPick(weights)] : undefined;
  }
  if (raw.kind === 'numeric-values') {
    if (!Array.isArray(raw.values) || raw.values.length === 0) {
      errors.push({ field: `${field}.values`, message: 'must list at least one {value, probability}' });
      return undefined;
    }
    const values = raw.values as unknown[];
    values.forEach((entry, i) => {
      if (!isRecord(entry) || typeof entry.value !== 'number' || !Number.isFinite(entry.value)) {
        errors.push({ field: `${field}.values[${i}].value`, message: 'must be a finite number' });
      } else if (!validWeight(entry.probability)) {
        errors.push({ field: `${field}.values[${i}].probability`, message: 'must be a probability of 0 or more' });
      }
    });
    if (errors.length > before) return undefined;
    const entries = values as { value: number; probability: number }[];
    const weights = entries.map((e) => e.probability);
    if (!weights.some((w) => w > 0)) {
      errors.push({ field: `${field}.values`, message: 'must give at least one value a probability above 0' });
      return undefined;
    }
    return (stream) => entries[stream.weightedPick(weights)].value;
  }
  if (raw.kind === 'normal') {
    const { mean, sd } = raw;
    if (typeof mean !== 'number' || !Number.isFinite(mean))
      errors.push({ field: `${field}.mean`, message: 'must be a finite number' });
    if (typeof sd !== 'number' || !Number.isFinite(sd) || sd < 0)
      errors.push({ field: `${field}.sd`, message: 'must be a number of 0 or more' });
    if (errors.length > before) return undefined;
    // Box–Muller, one normal value from two uniforms.
    return (stream) =>
      (mean as number) +
      (sd as number) * Math.sqrt(-2 * Math.log(stream.uniform())) * Math.cos(2 * Math.PI * stream.uniform());
  }
  errors.push({ field: `${field}.kind`, message: 'must be numeric-values or normal for a numeric covariate' });
  return undefined;
}

function relativeWeights(weights: number[]): number[] {
  const smallest = Math.min(...weights);
  return weights.map((w) => w / smallest);
}

function imbalanceOf(counts: ArrayLike<number>, weights: readonly number[]): number {
  let max = -Infinity;
  let min = Infinity;
  for (let i = 0; i < weights.length; i++) {
    const x = counts[i] / weights[i];
    if (x > max) max = x;
    if (x < min) min = x;
  }
  return max - min;
}

class Tracker {
  readonly counts = new Map<string, Int32Array>();
  readonly current = new Map<string, number>();
  constructor(
    keys: readonly string[],
    private readonly weights: readonly number[],
  ) {
    for (const key of keys) {
      this.counts.set(key, new Int32Array(weights.length));
      this.current.set(key, 0);
    }
  }
  add(key: string, arm: number): number {
    const row = this.counts.get(key) as Int32Array;
    row[arm] += 1;
    const imbalance = imbalanceOf(row, this.weights);
    this.current.set(key, imbalance);
    return imbalance;
  }
  largest(): number {
    let largest = 0;
    for (const value of this.current.values()) if (value > largest) largest = value;
    return largest;
  }
}

export function validateDryRunInput(input: unknown): FieldError[] {
  const errors: FieldError[] = [];
  if (!isRecord(input)) return [{ field: 'dryRun', message: 'must be an object' }];
  const parameters = validateSchemeParameters(input.parameters);
  if (!parameters.ok)
    errors.push(...parameters.errors.map((e) => ({ field: `parameters.${e.field}`, message: e.message })));
  const arrivals = input.arrivals;
  if (
    typeof arrivals !== 'number' ||
    !Number.isSafeInteger(arrivals) ||
    arrivals < 1 ||
    arrivals > MAX_DRY_RUN_ARRIVALS
  ) {
    errors.push({ field: 'arrivals', message: `must be a whole number from 1 to ${MAX_DRY_RUN_ARRIVALS}` });
  }
  try {
    normalizeSeed(input.seed);
  } catch (error) {
    if (!(error instanceof RandomizationError)) throw error;
    errors.push(...error.fieldErrors);
  }
  if (!isRecord(input.covariateMix))
    errors.push({ field: 'covariateMix', message: 'must be an object keyed by covariate id' });
  if (input.reportFactors !== undefined) {
    const probe = validateSchemeParameters({
      method: 'stratified-blocks',
      conditions: [
        { conditionId: 'a', weight: 1 },
        { conditionId: 'b', weight: 1 },
      ],
      blockSizes: [2],
      factors: input.reportFactors,
    });
    if (!probe.ok)
      errors.push(
        ...probe.errors.map((e) => ({ field: e.field.replace(/^factors/, 'reportFactors'), message: e.message })),
      );
  }
  if (errors.length === 0 && parameters.ok && Array.isArray(input.reportFactors)) {
    const schemeIds = new Set(schemeFactors(parameters.value).map((f) => f.id));
    (input.reportFactors as StratificationFactor[]).forEach((factor, i) => {
      if (schemeIds.has(factor.id)) {
        errors.push({
          field: `reportFactors[${i}].id`,
          message: `"${factor.id}" is already a factor of the scheme; it is reported anyway`,
        });
      }
    });
  }
  if (errors.length === 0 && parameters.ok) {
    const needs = covariateNeeds(parameters.value, (input.reportFactors as StratificationFactor[] | undefined) ?? []);
    const mix = input.covariateMix as Record<string, unknown>;
    for (const need of needs) samplerFor(need, Object.hasOwn(mix, need.id) ? mix[need.id] : undefined, errors);
  }
  return errors;
}

export function runDryRun(input: DryRunInput): DryRunResult {
  const errors = validateDryRunInput(input);
  if (errors.length > 0) throw new RandomizationError(RandomizationErrorCode.InvalidInput, errors);
  const parameters = parseSchemeParameters(input.parameters);
  const seed = normalizeSeed(input.seed);
  const reportFactors = input.reportFactors ?? [];
  const n = input.arrivals;

  const needs = covariateNeeds(parameters, reportFactors);
  const samplers = needs.map((need) => ({
    id: need.id,
    sample: samplerFor(need, input.covariateMix[need.id], []) as Sampler,
  }));
  const covariateStream = createSeededStream(seed, streamLabel.dryRunCovariates());
  const arrivals: RecordedArrival[] = [];
  for (let i = 0; i < n; i++) {
    const covariates: Record<string, number | string> = {};
    for (const { id, sample } of samplers) covariates[id] = sample(covariateStream);
    arrivals.push({ participantId: `simulated-${String(i + 1).padStart(6, '0')}`, covariates });
  }

  const derived = deriveSequence(seed, parameters, arrivals);

  // Arms: conditions with their weights, or the design's orders (each weight 1).
  let armIds: string[];
  let armLabels: string[];
  let weights: number[];
  if (isWithinDesign(parameters)) {
    const orders = ordersOf(parameters);
    armIds = orders.map((_, i) => `order-${i + 1}`);
    armLabels = orders.map((order) => order.join(' → '));
    weights = orders.map(() => 1);
  } else {
    armIds = parameters.conditions.map((c) => c.conditionId);
    armLabels = armIds.slice();
    weights = parameters.conditions.map((c) => c.weight);
  }
  const armOf = (a: (typeof derived)[number]): number =>
    a.orderIndex !== null ? a.orderIndex : armIds.indexOf(a.conditionId as string);
  const relative = relativeWeights(weights);

  const factors = schemeFactors(parameters);
  const levelFactors = [...factors, ...reportFactors.filter((f) => !factors.some((g) => g.id === f.id))];
  const levelKey = (factorId: string, level: string) => `${factorId}\u0000${level}`;
  const levelKeys = levelFactors.flatMap((f) => factorLevels(f).map((level) => levelKey(f.id, level)));
  const strataKeys = allStratumKeys(factors);

  const overall = new Tracker(['all'], relative);
  const strata = new Tracker(strataKeys, relative);
  const levels = new Tracker(levelKeys, relative);

  const bucket = Math.ceil(n / MAX_SERIES_POINTS);
  const series: ImbalancePoint[] = [];
  let peak = { overall: 0, inStratum: 0, inFactorLevel: 0 };
  let bucketPeak = { overall: 0, inStratum: 0, inFactorLevel: 0 };

  derived.forEach((allocation, i) => {
    const arm = armOf(allocation);
    const overallNow = overall.add('all', arm);
    const stratumNow = strata.add(allocation.stratumKey, arm);
    let levelNow = 0;
    const arrivalLevels =
      reportFactors.length > 0
        ? participantLevels(levelFactors, arrivals[i].covariates as Covariates)
        : allocation.levels;
    for (const factor of levelFactors) {
      levelNow = Math.max(levelNow, levels.add(levelKey(factor.id, arrivalLevels[factor.id]), arm));
    }
    bucketPeak = {
      overall: Math.max(bucketPeak.overall, overallNow),
      inStratum: Math.max(bucketPeak.inStratum, stratumNow),
      inFactorLevel: Math.max(bucketPeak.inFactorLevel, levelNow),
    };
    if ((i + 1) % bucket === 0 || i + 1 === n) {
      series.push({
        arrivals: i + 1,
        overall: bucketPeak.overall,
        largestInStratum: bucketPeak.inStratum,
        largestInFactorLevel: bucketPeak.inFactorLevel,
      });
      peak = {
        overall: Math.max(peak.overall, bucketPeak.overall),
        inStratum: Math.max(peak.inStratum, bucketPeak.inStratum),
        inFactorLevel: Math.max(peak.inFactorLevel, bucketPeak.inFactorLevel),
      };
      // The next stretch starts from where every stratum and level stands now, not from zero.
      bucketPeak = { overall: overall.largest(), inStratum: strata.largest(), inFactorLevel: levels.largest() };
    }
  });

  const countsRecord = (row: Int32Array) => Object.fromEntries(armIds.map((id, i) => [id, row[i]]));
  const sum = (row: Int32Array) => row.reduce((a, b) => a + b, 0);
  const totalWeightOfArms = weights.reduce((a, b) => a + b, 0);
  const overallRow = overall.counts.get('all') as Int32Array;

  let matchedPairs: DryRunResult['matchedPairs'] = null;
  if (parameters.method === 'matched-pairs') {
    const leftover = derived.find((a) => a.pairIndex === null);
    matchedPairs = { pairs: Math.floor(n / 2), leftoverParticipantId: leftover ? leftover.participantId : null };
  }

  return {
    arrivals: n,
    arms: armIds.map((armId, i) => ({
      armId,
      label: armLabels[i],
      count: overallRow[i],
      share: overallRow[i] / n,
      targetShare: weights[i] / totalWeightOfArms,
    })),
    strata: strataKeys.map((stratumKey) => {
      const row = strata.counts.get(stratumKey) as Int32Array;
      return {
        stratumKey,
        total: sum(row),
        counts: countsRecord(row),
        imbalance: strata.current.get(stratumKey) as number,
      };
    }),
    factorLevels: levelFactors.flatMap((factor) =>
      factorLevels(factor).map((level) => {
        const key = levelKey(factor.id, level);
        const row = levels.counts.get(key) as Int32Array;
        return {
          factorId: factor.id,
          level,
          total: sum(row),
          counts: countsRecord(row),
          imbalance: levels.current.get(key) as number,
        };
      }),
    ),
    imbalanceOverTime: series,
    largestImbalance: peak,
    finalImbalance: { overall: overall.largest(), inStratum: strata.largest(), inFactorLevel: levels.largest() },
    matchedPairs,
  };
}
