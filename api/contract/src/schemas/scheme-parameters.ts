import { z } from 'zod';
import { describeValue } from './field-errors';

/**
 * The rules of an assignment scheme, in one place: the api checks stored and submitted parameters with these
 * schemas, the OpenAPI document publishes them, and the admin screens share the limits.
 */

export const BETWEEN_METHODS = [
  'simple',
  'permuted-blocks',
  'stratified-blocks',
  'minimization',
  'matched-pairs',
] as const;
export const WITHIN_DESIGNS = ['counterbalanced', 'latin-square', 'williams'] as const;
export const SCHEME_METHODS = [...BETWEEN_METHODS, ...WITHIN_DESIGNS] as const;

export type BetweenMethod = (typeof BETWEEN_METHODS)[number];
export type WithinDesign = (typeof WITHIN_DESIGNS)[number];
export type SchemeMethod = (typeof SCHEME_METHODS)[number];
export type ImbalanceMeasure = 'range' | 'variance';

// Default p = 2/3: Efron's biased coin (Efron 1971, Biometrika 58:403-417) recommends 2/3, and Pocock & Simon
// (1975, Biometrics 31:103-115) build minimization on that coin, leaving p to the trial. From memory, not
// re-read; p = 1 gives Taves's (1974) deterministic minimization.
export const DEFAULT_COIN_PROBABILITY = 2 / 3;
export const DEFAULT_IMBALANCE_MEASURE: ImbalanceMeasure = 'range';
export const MIN_COIN_PROBABILITY = 0.5;
export const MAX_BLOCK_SIZE = 1000;
export const MAX_SQUARES_PER_BLOCK = 100;
export const FACTOR_ID_PATTERN = /^[A-Za-z0-9_.-]{1,64}$/;
const MAX_ID_LENGTH = 200;

export function isWithinMethod(method: string): method is WithinDesign {
  return (WITHIN_DESIGNS as readonly string[]).includes(method);
}

export function totalWeight(weights: readonly number[]): number {
  return weights.reduce((sum, weight) => sum + weight, 0);
}

/**
 * A block must hold every condition in its exact ratio, so its size is a multiple of the total weight: with weights
 * 1 : 2 the sizes 3, 6, 9 work and 5 does not. Null when the size fits.
 */
export function blockSizeMultipleProblem(size: number, weights: readonly number[]): string | null {
  const total = totalWeight(weights);
  if (total <= 0 || size % total === 0) return null;
  const examples = [1, 2, 3].map((m) => m * total).join(', ');
  return (
    `${size} is not a multiple of the total weight ${total} (${weights.join(' + ')}); ` +
    `a block must hold every condition in its ratio, so allowed sizes are ${examples}, …`
  );
}

export function isCoinProbability(p: number): boolean {
  return Number.isFinite(p) && p >= MIN_COIN_PROBABILITY && p <= 1;
}

/** The condition-count rule of each design, or null when the count fits. */
export function conditionCountProblem(method: SchemeMethod, count: number): string | null {
  if (method === 'matched-pairs' && count !== 2) return `matched pairs need exactly two conditions (got ${count})`;
  if (method === 'counterbalanced' && count !== 2)
    return `AB/BA counterbalancing needs exactly two conditions (got ${count}); use latin-square or williams for three or more`;
  if ((method === 'latin-square' || method === 'williams') && count < 3) {
    const name = method === 'williams' ? 'a Williams design' : 'a Latin square';
    return `${name} needs at least three conditions (got ${count}); use counterbalanced for two`;
  }
  if (!isWithinMethod(method) && count < 2)
    return count === 0 ? 'is empty; at least two conditions are needed' : 'at least two conditions are needed';
  return null;
}

const wholeNumberOfOneOrMore = (issue: { input?: unknown }) =>
  `must be a whole number of 1 or more (got ${describeValue(issue.input)})`;

function duplicates(
  values: readonly unknown[],
  ctx: z.RefinementCtx,
  message: (value: unknown, firstIndex: number) => string,
  pathOf: (i: number) => PropertyKey[] = (i) => [i],
): void {
  const firstIndex = new Map<unknown, number>();
  values.forEach((value, i) => {
    if (value === '') return;
    const seen = firstIndex.get(value);
    if (seen === undefined) firstIndex.set(value, i);
    else ctx.addIssue({ code: 'custom', path: pathOf(i), message: message(value, seen), input: value });
  });
}

const conditionIdSchema = z
  .string({ error: 'must be a non-empty condition id' })
  .refine((id) => id.trim() !== '', 'must be a non-empty condition id')
  .refine((id) => id.length <= MAX_ID_LENGTH, `must be at most ${MAX_ID_LENGTH} characters`);

export const conditionAllocationSchema = z
  .strictObject(
    {
      conditionId: conditionIdSchema,
      weight: z.int({ error: wholeNumberOfOneOrMore }).min(1, { error: wholeNumberOfOneOrMore }),
    },
    {
      error: (issue) =>
        issue.code === 'unrecognized_keys'
          ? 'is not a condition setting'
          : 'must be an object with conditionId and weight',
    },
  )
  .meta({ description: 'A condition and its integer allocation weight (2 and 1 give a 2:1 ratio)' });

const conditionsSchema = z
  .array(conditionAllocationSchema, { error: 'must be a list of conditions with their weights' })
  .min(2, {
    error: (issue) =>
      Array.isArray(issue.input) && issue.input.length === 0
        ? 'is empty; at least two conditions are needed'
        : 'at least two conditions are needed',
  })
  .superRefine((conditions, ctx) =>
    duplicates(
      conditions.map((c) => c.conditionId),
      ctx,
      (value, first) => `"${String(value)}" is listed twice (also at conditions[${first}].conditionId)`,
      (i) => [i, 'conditionId'],
    ),
  );

const blockSizesSchema = z
  .array(
    z
      .int({ error: wholeNumberOfOneOrMore })
      .min(1, { error: wholeNumberOfOneOrMore })
      .max(MAX_BLOCK_SIZE, {
        error: (issue) => `must be at most ${MAX_BLOCK_SIZE} (got ${describeValue(issue.input)})`,
      }),
    { error: 'must list at least one allowed block size' },
  )
  .min(1, 'must list at least one allowed block size')
  .superRefine((sizes, ctx) =>
    duplicates(sizes, ctx, (size) => `${String(size)} is listed twice; list each allowed size once`),
  )
  .meta({
    description: 'Allowed block sizes, each a multiple of the total weight; each block’s size is drawn from this list',
  });

const factorIdSchema = z
  .string({ error: 'must be 1-64 letters, digits, "_", "." or "-" (the covariate key)' })
  .regex(FACTOR_ID_PATTERN, 'must be 1-64 letters, digits, "_", "." or "-" (the covariate key)');

const cutPointsSchema = z
  .array(z.number({ error: (issue) => `must be a finite number (got ${describeValue(issue.input)})` }), {
    error: 'must list at least one cut point (e.g. [65] for below 65 / 65 or above)',
  })
  .min(1, 'must list at least one cut point (e.g. [65] for below 65 / 65 or above)')
  .superRefine((cuts, ctx) => {
    cuts.forEach((cut, i) => {
      const previous = cuts[i - 1];
      if (previous === undefined) return;
      if (cut === previous)
        ctx.addIssue({
          code: 'custom',
          path: [i],
          message: `${cut} is listed twice; each cut point must be different`,
        });
      else if (cut < previous)
        ctx.addIssue({
          code: 'custom',
          path: [i],
          message: `${cut} comes after ${previous}; list cut points in increasing order`,
        });
    });
  });

const categorySchema = z
  .string({ error: 'must be a non-empty text' })
  .refine((category) => category.trim() !== '', 'must be a non-empty text')
  .refine((category) => !category.includes('|'), 'must not contain "|" (it separates factors in a stratum key)')
  .refine((category) => category.length <= MAX_ID_LENGTH, `must be at most ${MAX_ID_LENGTH} characters`);

const categoriesSchema = z
  .array(categorySchema, { error: 'must list at least two categories' })
  .min(2, 'must list at least two categories')
  .superRefine((categories, ctx) =>
    duplicates(categories, ctx, (value, first) => `"${String(value)}" is listed twice (also at categories[${first}])`),
  );

const factorObject = { error: 'must be an object with id, kind and its cut points or categories' };
const notAFactorSetting = (issue: { code?: string }) =>
  issue.code === 'unrecognized_keys' ? 'is not a setting of this factor' : factorObject.error;

export const numericFactorSchema = z
  .strictObject(
    { id: factorIdSchema, kind: z.literal('numeric'), cutPoints: cutPointsSchema },
    { error: notAFactorSetting },
  )
  .meta({ description: 'A numeric covariate split at cut points: a value at or above a cut falls in the upper level' });

export const categoricalFactorSchema = z
  .strictObject(
    { id: factorIdSchema, kind: z.literal('categorical'), categories: categoriesSchema },
    { error: notAFactorSetting },
  )
  .meta({ description: 'A categorical covariate with its listed categories' });

const factorKind = {
  error: (issue: { input?: unknown }) => {
    const kind =
      typeof issue.input === 'object' && issue.input !== null ? (issue.input as { kind?: unknown }).kind : undefined;
    return `must be numeric or categorical (got ${describeValue(kind)})`;
  },
};

export const stratificationFactorSchema = z.discriminatedUnion(
  'kind',
  [numericFactorSchema, categoricalFactorSchema],
  factorKind,
);

const factorWeight = z
  .number({ error: (issue) => `must be a number greater than 0 (got ${describeValue(issue.input)})` })
  .positive({ error: (issue) => `must be a number greater than 0 (got ${describeValue(issue.input)})` });

export const minimizationFactorSchema = z.discriminatedUnion(
  'kind',
  [numericFactorSchema.extend({ weight: factorWeight }), categoricalFactorSchema.extend({ weight: factorWeight })],
  factorKind,
);

function factorList<F extends z.ZodType<{ id: string }>>(factor: F, required: boolean) {
  const list = z.array(factor, { error: 'must be a list of factors' });
  return (required ? list.min(1, 'must list at least one factor') : list).superRefine((factors, ctx) =>
    duplicates(
      factors.map((f) => f.id),
      ctx,
      (value, first) => `"${String(value)}" is listed twice (also at factors[${first}].id)`,
      (i) => [i, 'id'],
    ),
  );
}

const unknownSetting = (method: SchemeMethod) => ({
  error: (issue: { code?: string }) =>
    issue.code === 'unrecognized_keys'
      ? `is not a setting of the ${method} scheme`
      : 'must be an object with a method and its settings',
});

/** Block sizes must be multiples of the total weight; checked once the conditions and sizes are each valid. */
function blockSizesFitWeights(
  value: { conditions: { weight: number }[]; blockSizes: number[] },
  ctx: z.RefinementCtx,
): void {
  const weights = value.conditions.map((c) => c.weight);
  value.blockSizes.forEach((size, i) => {
    const problem = blockSizeMultipleProblem(size, weights);
    if (problem) ctx.addIssue({ code: 'custom', path: ['blockSizes', i], message: problem, input: size });
  });
}

export const simpleParametersSchema = z
  .strictObject({ method: z.literal('simple'), conditions: conditionsSchema }, unknownSetting('simple'))
  .meta({ id: 'SimpleParameters' });

export const permutedBlocksParametersSchema = z
  .strictObject(
    { method: z.literal('permuted-blocks'), conditions: conditionsSchema, blockSizes: blockSizesSchema },
    unknownSetting('permuted-blocks'),
  )
  .superRefine(blockSizesFitWeights)
  .meta({ id: 'PermutedBlocksParameters' });

export const stratifiedBlocksParametersSchema = z
  .strictObject(
    {
      method: z.literal('stratified-blocks'),
      conditions: conditionsSchema,
      blockSizes: blockSizesSchema,
      factors: factorList(stratificationFactorSchema, true),
    },
    unknownSetting('stratified-blocks'),
  )
  .superRefine(blockSizesFitWeights)
  .meta({ id: 'StratifiedBlocksParameters' });

const coinProbabilityMessage = (issue: { input?: unknown }) =>
  `must be a number from 0.5 (no preference) to 1 (always the least-imbalanced condition) (got ${describeValue(issue.input)})`;

export const coinProbabilitySchema = z
  .number({ error: coinProbabilityMessage })
  .min(MIN_COIN_PROBABILITY, { error: coinProbabilityMessage })
  .max(1, { error: coinProbabilityMessage })
  .meta({ description: 'Probability of assigning the least-imbalanced condition, from 0.5 to 1' });

export const imbalanceMeasureSchema = z.enum(['range', 'variance'], {
  error: (issue) => `must be range or variance (got ${describeValue(issue.input)})`,
});

export const minimizationParametersSchema = z
  .strictObject(
    {
      method: z.literal('minimization'),
      conditions: conditionsSchema,
      factors: factorList(minimizationFactorSchema, true),
      measure: imbalanceMeasureSchema.default(DEFAULT_IMBALANCE_MEASURE),
      coinProbability: coinProbabilitySchema.default(DEFAULT_COIN_PROBABILITY),
    },
    unknownSetting('minimization'),
  )
  .meta({ id: 'MinimizationParameters' });

export const matchedPairsParametersSchema = z
  .strictObject(
    {
      method: z.literal('matched-pairs'),
      conditions: conditionsSchema,
      pretestId: z
        .string({ error: 'must name the numeric pretest covariate (1-64 letters, digits, "_", "." or "-")' })
        .regex(FACTOR_ID_PATTERN, 'must name the numeric pretest covariate (1-64 letters, digits, "_", "." or "-")')
        .meta({ description: 'Covariate key of the numeric pretest used for sorting' }),
    },
    unknownSetting('matched-pairs'),
  )
  .superRefine((value, ctx) => {
    const [first, second] = value.conditions;
    const countProblem = conditionCountProblem('matched-pairs', value.conditions.length);
    if (countProblem && value.conditions.length > 0)
      ctx.addIssue({ code: 'custom', path: ['conditions'], message: countProblem });
    else if (first && second && first.weight !== second.weight)
      ctx.addIssue({
        code: 'custom',
        path: ['conditions', 1, 'weight'],
        message: 'matched pairs allocate 1:1, so both conditions must have the same weight',
      });
  })
  .meta({ id: 'MatchedPairsParameters' });

const squaresPerBlockMessage = (issue: { input?: unknown }) =>
  `must be a whole number from 1 to ${MAX_SQUARES_PER_BLOCK} (got ${describeValue(issue.input)})`;

export const squaresPerBlockSchema = z
  .array(
    z
      .int({ error: squaresPerBlockMessage })
      .min(1, { error: squaresPerBlockMessage })
      .max(MAX_SQUARES_PER_BLOCK, { error: squaresPerBlockMessage }),
    { error: 'must list at least one block size, in whole copies of the design' },
  )
  .min(1, 'must list at least one block size, in whole copies of the design')
  .superRefine((counts, ctx) =>
    duplicates(counts, ctx, (count) => `${String(count)} is listed twice; list each size once`),
  )
  .meta({ description: 'Allowed block sizes in whole copies of the design’s orders; default [1]' });

function withinParametersSchema<M extends WithinDesign>(method: M, id: string) {
  return z
    .strictObject(
      {
        method: z.literal(method),
        conditionIds: z
          .array(conditionIdSchema, { error: 'must be a list of condition ids' })
          .superRefine((ids, ctx) => {
            const problem = conditionCountProblem(method, ids.length);
            if (problem) ctx.addIssue({ code: 'custom', message: problem });
            duplicates(
              ids,
              ctx,
              (value, first) => `"${String(value)}" is listed twice (also at conditionIds[${first}])`,
            );
          })
          .meta({ description: 'Conditions in the order that defines the design’s first row' }),
        squaresPerBlock: squaresPerBlockSchema.default([1]),
        factors: factorList(stratificationFactorSchema, false)
          .default([])
          .meta({ description: 'Optional stratification; empty means one sequence for the whole study' }),
      },
      unknownSetting(method),
    )
    .meta({ id });
}

export const counterbalancedParametersSchema = withinParametersSchema('counterbalanced', 'CounterbalancedParameters');
export const latinSquareParametersSchema = withinParametersSchema('latin-square', 'LatinSquareParameters');
export const williamsParametersSchema = withinParametersSchema('williams', 'WilliamsParameters');

/** Each method's own schema, for checking parameters once the method is known. */
export const schemeParametersSchemaByMethod = {
  simple: simpleParametersSchema,
  'permuted-blocks': permutedBlocksParametersSchema,
  'stratified-blocks': stratifiedBlocksParametersSchema,
  minimization: minimizationParametersSchema,
  'matched-pairs': matchedPairsParametersSchema,
  counterbalanced: counterbalancedParametersSchema,
  'latin-square': latinSquareParametersSchema,
  williams: williamsParametersSchema,
} as const;

const methodMessage = (issue: { input?: unknown }) => {
  const method =
    typeof issue.input === 'object' && issue.input !== null ? (issue.input as { method?: unknown }).method : undefined;
  return `must be one of ${SCHEME_METHODS.join(', ')} (got ${describeValue(method)})`;
};

/** The full, normalized parameters of an assignment scheme: what is stored, committed to and replayed. */
export const schemeParametersSchema = z
  .discriminatedUnion(
    'method',
    [
      simpleParametersSchema,
      permutedBlocksParametersSchema,
      stratifiedBlocksParametersSchema,
      minimizationParametersSchema,
      matchedPairsParametersSchema,
      counterbalancedParametersSchema,
      latinSquareParametersSchema,
      williamsParametersSchema,
    ],
    { error: methodMessage },
  )
  .meta({ id: 'SchemeParameters' });

export type ConditionAllocation = z.output<typeof conditionAllocationSchema>;
export type NumericFactor = z.output<typeof numericFactorSchema>;
export type CategoricalFactor = z.output<typeof categoricalFactorSchema>;
export type StratificationFactor = z.output<typeof stratificationFactorSchema>;
export type MinimizationFactor = z.output<typeof minimizationFactorSchema>;
export type SimpleParameters = z.output<typeof simpleParametersSchema>;
export type PermutedBlocksParameters = z.output<typeof permutedBlocksParametersSchema>;
export type StratifiedBlocksParameters = z.output<typeof stratifiedBlocksParametersSchema>;
export type MinimizationParameters = z.output<typeof minimizationParametersSchema>;
export type MatchedPairsParameters = z.output<typeof matchedPairsParametersSchema>;
export type WithinOrdersParameters = z.output<
  typeof counterbalancedParametersSchema | typeof latinSquareParametersSchema | typeof williamsParametersSchema
>;
export type BetweenSchemeParameters =
  | SimpleParameters
  | PermutedBlocksParameters
  | StratifiedBlocksParameters
  | MinimizationParameters
  | MatchedPairsParameters;
export type SchemeParameters = z.output<typeof schemeParametersSchema>;
