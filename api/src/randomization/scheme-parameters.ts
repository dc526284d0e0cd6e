import { FieldError, RandomizationError, RandomizationErrorCode } from './randomization-error';

/** A condition taking part in a between-subjects scheme, with its integer allocation weight (2 and 1 give a 2:1 ratio). */
export interface ConditionAllocation {
  conditionId: string;
  weight: number;
}

/** A numeric covariate (e.g. a pretest score) split at cut points: a value at or above a cut falls in the upper level. */
export interface NumericFactor {
  id: string;
  kind: 'numeric';
  cutPoints: number[];
}

/** A categorical covariate with its listed categories. */
export interface CategoricalFactor {
  id: string;
  kind: 'categorical';
  categories: string[];
}

/** A stratification factor. `id` is the covariate's key in a participant's covariates. */
export type StratificationFactor = NumericFactor | CategoricalFactor;

/** A factor used by minimization, with its weight in the total imbalance. */
export type MinimizationFactor = StratificationFactor & { weight: number };

export type ImbalanceMeasure = 'range' | 'variance';

export interface SimpleParameters {
  method: 'simple';
  conditions: ConditionAllocation[];
}

export interface PermutedBlocksParameters {
  method: 'permuted-blocks';
  conditions: ConditionAllocation[];
  /** Allowed block sizes, each a multiple of the total weight; each block's size is drawn from this list. */
  blockSizes: number[];
}

export interface StratifiedBlocksParameters {
  method: 'stratified-blocks';
  conditions: ConditionAllocation[];
  blockSizes: number[];
  factors: StratificationFactor[];
}

export interface MinimizationParameters {
  method: 'minimization';
  conditions: ConditionAllocation[];
  factors: MinimizationFactor[];
  measure: ImbalanceMeasure;
  /** Probability of assigning the least-imbalanced condition, in [0.5, 1]. */
  coinProbability: number;
}

export interface MatchedPairsParameters {
  method: 'matched-pairs';
  /** Exactly two conditions with equal weights. */
  conditions: ConditionAllocation[];
  /** Covariate key of the numeric pretest used for sorting. */
  pretestId: string;
}

export type WithinDesign = 'counterbalanced' | 'latin-square' | 'williams';

export interface WithinOrdersParameters {
  method: WithinDesign;
  /** Conditions in the order that defines the design's first row. */
  conditionIds: string[];
  /** Allowed block sizes in whole copies of the design's orders; default [1]. */
  squaresPerBlock: number[];
  /** Optional stratification; empty means one sequence for the whole study. */
  factors: StratificationFactor[];
}

export type BetweenSchemeParameters =
  | SimpleParameters
  | PermutedBlocksParameters
  | StratifiedBlocksParameters
  | MinimizationParameters
  | MatchedPairsParameters;

/** The full, normalized parameters of an assignment scheme: what is stored, committed to and replayed. */
export type SchemeParameters = BetweenSchemeParameters | WithinOrdersParameters;

export type SchemeMethod = SchemeParameters['method'];

export const SCHEME_METHODS: readonly SchemeMethod[] = [
  'simple',
  'permuted-blocks',
  'stratified-blocks',
  'minimization',
  'matched-pairs',
  'counterbalanced',
  'latin-square',
  'williams',
];

export const WITHIN_DESIGNS: readonly WithinDesign[] = ['counterbalanced', 'latin-square', 'williams'];

// Default p = 2/3: Efron's biased coin (Efron 1971, Biometrika 58:403-417) recommends 2/3, and Pocock & Simon
// (1975, Biometrics 31:103-115) build minimization on that coin, leaving p to the trial. From memory, not
// re-read; p = 1 gives Taves's (1974) deterministic minimization.
export const DEFAULT_COIN_PROBABILITY = 2 / 3;
export const DEFAULT_IMBALANCE_MEASURE: ImbalanceMeasure = 'range';

export const MAX_BLOCK_SIZE = 1000;
export const MAX_SQUARES_PER_BLOCK = 100;
const FACTOR_ID_PATTERN = /^[A-Za-z0-9_.-]{1,64}$/;
const MAX_ID_LENGTH = 200;

export type ValidationResult<T> = { ok: true; value: T } | { ok: false; errors: FieldError[] };

export function isWithinDesign(parameters: SchemeParameters): parameters is WithinOrdersParameters {
  return (WITHIN_DESIGNS as readonly string[]).includes(parameters.method);
}

export function totalWeight(conditions: readonly ConditionAllocation[]): number {
  return conditions.reduce((sum, c) => sum + c.weight, 0);
}

/**
 * Checks raw input (e.g. a request body or a stored JSON column) and returns the normalized parameters
 * (defaults filled in, unknown fields refused) or every problem found, each naming its field.
 */
export function validateSchemeParameters(input: unknown): ValidationResult<SchemeParameters> {
  const errors: FieldError[] = [];
  const value = readScheme(input, errors);
  if (errors.length > 0 || value === undefined) return { ok: false, errors };
  return { ok: true, value };
}

/** As validateSchemeParameters, but throws a RandomizationError listing the field errors. */
export function parseSchemeParameters(input: unknown): SchemeParameters {
  const result = validateSchemeParameters(input);
  if (!result.ok) throw new RandomizationError(RandomizationErrorCode.InvalidParameters, result.errors);
  return result.value;
}

/** Parses and also checks that the method is the one the caller needs. */
export function parseParametersOf<M extends SchemeMethod>(
  input: unknown,
  methods: readonly M[],
): Extract<SchemeParameters, { method: M }> {
  const parameters = parseSchemeParameters(input);
  if (!(methods as readonly string[]).includes(parameters.method)) {
    throw new RandomizationError(RandomizationErrorCode.InvalidParameters, [
      { field: 'method', message: `expected ${methods.join(' or ')}, got ${parameters.method}` },
    ]);
  }
  return parameters as Extract<SchemeParameters, { method: M }>;
}

type Raw = Record<string, unknown>;

const FIELDS_BY_METHOD: Record<SchemeMethod, readonly string[]> = {
  simple: ['method', 'conditions'],
  'permuted-blocks': ['method', 'conditions', 'blockSizes'],
  'stratified-blocks': ['method', 'conditions', 'blockSizes', 'factors'],
  minimization: ['method', 'conditions', 'factors', 'measure', 'coinProbability'],
  'matched-pairs': ['method', 'conditions', 'pretestId'],
  counterbalanced: ['method', 'conditionIds', 'squaresPerBlock', 'factors'],
  'latin-square': ['method', 'conditionIds', 'squaresPerBlock', 'factors'],
  williams: ['method', 'conditionIds', 'squaresPerBlock', 'factors'],
};

function isRecord(value: unknown): value is Raw {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function isPositiveInteger(value: unknown): value is number {
  return typeof value === 'number' && Number.isSafeInteger(value) && value >= 1;
}

function describe(value: unknown): string {
  if (typeof value === 'string') return `"${value}"`;
  if (value === undefined) return 'nothing';
  return JSON.stringify(value) ?? String(value);
}

function readScheme(input: unknown, errors: FieldError[]): SchemeParameters | undefined {
  if (!isRecord(input)) {
    errors.push({ field: 'parameters', message: 'must be an object with a method and its settings' });
    return undefined;
  }
  const method = input.method;
  if (typeof method !== 'string' || !(SCHEME_METHODS as readonly string[]).includes(method)) {
    errors.push({ field: 'method', message: `must be one of ${SCHEME_METHODS.join(', ')} (got ${describe(method)})` });
    return undefined;
  }
  const schemeMethod = method as SchemeMethod;
  for (const key of Object.keys(input)) {
    if (!FIELDS_BY_METHOD[schemeMethod].includes(key)) {
      errors.push({ field: key, message: `is not a setting of the ${schemeMethod} scheme` });
    }
  }

  switch (schemeMethod) {
    case 'simple':
      return { method: schemeMethod, conditions: readConditions(input.conditions, errors) };
    case 'permuted-blocks': {
      const conditions = readConditions(input.conditions, errors);
      return { method: schemeMethod, conditions, blockSizes: readBlockSizes(input.blockSizes, conditions, errors) };
    }
    case 'stratified-blocks': {
      const conditions = readConditions(input.conditions, errors);
      const blockSizes = readBlockSizes(input.blockSizes, conditions, errors);
      const factors = readFactors(input.factors, 'factors', errors, { required: true, weighted: false });
      return { method: schemeMethod, conditions, blockSizes, factors };
    }
    case 'minimization': {
      const conditions = readConditions(input.conditions, errors);
      const factors = readFactors(input.factors, 'factors', errors, {
        required: true,
        weighted: true,
      }) as MinimizationFactor[];
      return {
        method: schemeMethod,
        conditions,
        factors,
        measure: readMeasure(input.measure, errors),
        coinProbability: readCoinProbability(input.coinProbability, errors),
      };
    }
    case 'matched-pairs': {
      const conditions = readConditions(input.conditions, errors);
      if (conditions.length > 0 && conditions.length !== 2) {
        errors.push({
          field: 'conditions',
          message: `matched pairs need exactly two conditions (got ${conditions.length})`,
        });
      } else if (conditions.length === 2 && conditions[0].weight !== conditions[1].weight) {
        errors.push({
          field: 'conditions[1].weight',
          message: 'matched pairs allocate 1:1, so both conditions must have the same weight',
        });
      }
      const pretestId = input.pretestId;
      if (typeof pretestId !== 'string' || !FACTOR_ID_PATTERN.test(pretestId)) {
        errors.push({
          field: 'pretestId',
          message: 'must name the numeric pretest covariate (1-64 letters, digits, "_", "." or "-")',
        });
      }
      return { method: schemeMethod, conditions, pretestId: String(pretestId) };
    }
    case 'counterbalanced':
    case 'latin-square':
    case 'williams':
      return {
        method: schemeMethod,
        conditionIds: readConditionIds(input.conditionIds, schemeMethod, errors),
        squaresPerBlock: readSquaresPerBlock(input.squaresPerBlock, errors),
        factors: readFactors(input.factors, 'factors', errors, { required: false, weighted: false }),
      };
  }
}

function readConditionId(value: unknown, field: string, errors: FieldError[]): string {
  if (typeof value !== 'string' || value.trim() === '') {
    errors.push({ field, message: 'must be a non-empty condition id' });
    return '';
  }
  if (value.length > MAX_ID_LENGTH) {
    errors.push({ field, message: `must be at most ${MAX_ID_LENGTH} characters` });
  }
  return value;
}

function reportDuplicates(values: readonly string[], fieldOf: (i: number) => string, errors: FieldError[]): void {
  const firstIndex = new Map<string, number>();
  values.forEach((value, i) => {
    if (value === '') return;
    const seen = firstIndex.get(value);
    if (seen === undefined) firstIndex.set(value, i);
    else errors.push({ field: fieldOf(i), message: `"${value}" is listed twice (also at ${fieldOf(seen)})` });
  });
}

function readConditions(value: unknown, errors: FieldError[]): ConditionAllocation[] {
  if (!Array.isArray(value)) {
    errors.push({ field: 'conditions', message: 'must be a list of conditions with their weights' });
    return [];
  }
  if (value.length < 2) {
    errors.push({
      field: 'conditions',
      message:
        value.length === 0 ? 'is empty; at least two conditions are needed' : 'at least two conditions are needed',
    });
  }
  const conditions = value.map((raw, i): ConditionAllocation => {
    const field = `conditions[${i}]`;
    if (!isRecord(raw)) {
      errors.push({ field, message: 'must be an object with conditionId and weight' });
      return { conditionId: '', weight: 0 };
    }
    for (const key of Object.keys(raw)) {
      if (key !== 'conditionId' && key !== 'weight')
        errors.push({ field: `${field}.${key}`, message: 'is not a condition setting' });
    }
    const conditionId = readConditionId(raw.conditionId, `${field}.conditionId`, errors);
    const weight = raw.weight;
    if (!isPositiveInteger(weight)) {
      errors.push({
        field: `${field}.weight`,
        message: `must be a whole number of 1 or more (got ${describe(weight)})`,
      });
      return { conditionId, weight: 0 };
    }
    return { conditionId, weight };
  });
  reportDuplicates(
    conditions.map((c) => c.conditionId),
    (i) => `conditions[${i}].conditionId`,
    errors,
  );
  return conditions;
}

function readBlockSizes(value: unknown, conditions: ConditionAllocation[], errors: FieldError[]): number[] {
  if (!Array.isArray(value) || value.length === 0) {
    errors.push({ field: 'blockSizes', message: 'must list at least one allowed block size' });
    return [];
  }
  const weightsKnown = conditions.length > 0 && conditions.every((c) => c.weight >= 1);
  const total = totalWeight(conditions);
  const sizes: number[] = [];
  value.forEach((size, i) => {
    const field = `blockSizes[${i}]`;
    if (!isPositiveInteger(size)) {
      errors.push({ field, message: `must be a whole number of 1 or more (got ${describe(size)})` });
      return;
    }
    if (size > MAX_BLOCK_SIZE) {
      errors.push({ field, message: `must be at most ${MAX_BLOCK_SIZE} (got ${size})` });
      return;
    }
    if (weightsKnown && size % total !== 0) {
      const examples = [1, 2, 3].map((m) => m * total).join(', ');
      errors.push({
        field,
        message:
          `${size} is not a multiple of the total weight ${total} (${conditions.map((c) => c.weight).join(' + ')}); ` +
          `a block must hold every condition in its ratio, so allowed sizes are ${examples}, …`,
      });
      return;
    }
    if (sizes.includes(size)) {
      errors.push({ field, message: `${size} is listed twice; list each allowed size once` });
      return;
    }
    sizes.push(size);
  });
  return sizes;
}

function readFactors(
  value: unknown,
  field: string,
  errors: FieldError[],
  options: { required: boolean; weighted: boolean },
): StratificationFactor[] {
  if (value === undefined && !options.required) return [];
  if (!Array.isArray(value)) {
    errors.push({ field, message: 'must be a list of factors' });
    return [];
  }
  if (value.length === 0 && options.required) {
    errors.push({ field, message: 'must list at least one factor' });
  }
  const factors = value.map((raw, i) => readFactor(raw, `${field}[${i}]`, errors, options.weighted));
  reportDuplicates(
    factors.map((f) => f.id),
    (i) => `${field}[${i}].id`,
    errors,
  );
  return factors;
}

function readFactor(raw: unknown, field: string, errors: FieldError[], weighted: boolean): StratificationFactor {
  if (!isRecord(raw)) {
    errors.push({ field, message: 'must be an object with id, kind and its cut points or categories' });
    return { id: '', kind: 'categorical', categories: [] };
  }
  const allowed = ['id', 'kind', raw.kind === 'numeric' ? 'cutPoints' : 'categories', ...(weighted ? ['weight'] : [])];
  for (const key of Object.keys(raw)) {
    if (!allowed.includes(key)) errors.push({ field: `${field}.${key}`, message: 'is not a setting of this factor' });
  }
  const id = typeof raw.id === 'string' ? raw.id : '';
  if (!FACTOR_ID_PATTERN.test(id)) {
    errors.push({ field: `${field}.id`, message: 'must be 1-64 letters, digits, "_", "." or "-" (the covariate key)' });
  }
  let factor: StratificationFactor;
  if (raw.kind === 'numeric') {
    factor = { id, kind: 'numeric', cutPoints: readCutPoints(raw.cutPoints, `${field}.cutPoints`, errors) };
  } else if (raw.kind === 'categorical') {
    factor = { id, kind: 'categorical', categories: readCategories(raw.categories, `${field}.categories`, errors) };
  } else {
    errors.push({ field: `${field}.kind`, message: `must be numeric or categorical (got ${describe(raw.kind)})` });
    factor = { id, kind: 'categorical', categories: [] };
  }
  if (weighted) {
    const weight = raw.weight;
    if (typeof weight !== 'number' || !Number.isFinite(weight) || weight <= 0) {
      errors.push({ field: `${field}.weight`, message: `must be a number greater than 0 (got ${describe(weight)})` });
    }
    return { ...factor, weight: Number(weight) } as MinimizationFactor;
  }
  return factor;
}

function readCutPoints(value: unknown, field: string, errors: FieldError[]): number[] {
  if (!Array.isArray(value) || value.length === 0) {
    errors.push({ field, message: 'must list at least one cut point (e.g. [65] for below 65 / 65 or above)' });
    return [];
  }
  const cuts: number[] = [];
  value.forEach((cut, i) => {
    if (typeof cut !== 'number' || !Number.isFinite(cut)) {
      errors.push({ field: `${field}[${i}]`, message: `must be a finite number (got ${describe(cut)})` });
      return;
    }
    const previous = cuts[cuts.length - 1];
    if (previous !== undefined && cut === previous) {
      errors.push({ field: `${field}[${i}]`, message: `${cut} is listed twice; each cut point must be different` });
    } else if (previous !== undefined && cut < previous) {
      errors.push({
        field: `${field}[${i}]`,
        message: `${cut} comes after ${previous}; list cut points in increasing order`,
      });
    }
    cuts.push(cut);
  });
  return cuts;
}

function readCategories(value: unknown, field: string, errors: FieldError[]): string[] {
  if (!Array.isArray(value) || value.length < 2) {
    errors.push({ field, message: 'must list at least two categories' });
    return Array.isArray(value) ? value.map(String) : [];
  }
  const categories = value.map((category, i) => {
    if (typeof category !== 'string' || category.trim() === '') {
      errors.push({ field: `${field}[${i}]`, message: 'must be a non-empty text' });
      return '';
    }
    if (category.includes('|')) {
      errors.push({ field: `${field}[${i}]`, message: 'must not contain "|" (it separates factors in a stratum key)' });
    }
    if (category.length > MAX_ID_LENGTH) {
      errors.push({ field: `${field}[${i}]`, message: `must be at most ${MAX_ID_LENGTH} characters` });
    }
    return category;
  });
  reportDuplicates(categories, (i) => `${field}[${i}]`, errors);
  return categories;
}

function readMeasure(value: unknown, errors: FieldError[]): ImbalanceMeasure {
  if (value === undefined) return DEFAULT_IMBALANCE_MEASURE;
  if (value !== 'range' && value !== 'variance') {
    errors.push({ field: 'measure', message: `must be range or variance (got ${describe(value)})` });
    return DEFAULT_IMBALANCE_MEASURE;
  }
  return value;
}

function readCoinProbability(value: unknown, errors: FieldError[]): number {
  if (value === undefined) return DEFAULT_COIN_PROBABILITY;
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0.5 || value > 1) {
    errors.push({
      field: 'coinProbability',
      message: `must be a number from 0.5 (no preference) to 1 (always the least-imbalanced condition) (got ${describe(value)})`,
    });
    return DEFAULT_COIN_PROBABILITY;
  }
  return value;
}

function readConditionIds(value: unknown, design: WithinDesign, errors: FieldError[]): string[] {
  if (!Array.isArray(value)) {
    errors.push({ field: 'conditionIds', message: 'must be a list of condition ids' });
    return [];
  }
  if (design === 'counterbalanced' && value.length !== 2) {
    errors.push({
      field: 'conditionIds',
      message: `AB/BA counterbalancing needs exactly two conditions (got ${value.length}); use latin-square or williams for three or more`,
    });
  }
  if (design !== 'counterbalanced' && value.length < 3) {
    const name = design === 'williams' ? 'a Williams design' : 'a Latin square';
    errors.push({
      field: 'conditionIds',
      message: `${name} needs at least three conditions (got ${value.length}); use counterbalanced for two`,
    });
  }
  const ids = value.map((id, i) => readConditionId(id, `conditionIds[${i}]`, errors));
  reportDuplicates(ids, (i) => `conditionIds[${i}]`, errors);
  return ids;
}

function readSquaresPerBlock(value: unknown, errors: FieldError[]): number[] {
  if (value === undefined) return [1];
  if (!Array.isArray(value) || value.length === 0) {
    errors.push({
      field: 'squaresPerBlock',
      message: 'must list at least one block size, in whole copies of the design',
    });
    return [1];
  }
  value.forEach((count, i) => {
    if (!isPositiveInteger(count) || count > MAX_SQUARES_PER_BLOCK) {
      errors.push({
        field: `squaresPerBlock[${i}]`,
        message: `must be a whole number from 1 to ${MAX_SQUARES_PER_BLOCK} (got ${describe(count)})`,
      });
    } else if (value.indexOf(count) !== i) {
      errors.push({ field: `squaresPerBlock[${i}]`, message: `${count} is listed twice; list each size once` });
    }
  });
  return value as number[];
}
