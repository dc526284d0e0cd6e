import { z } from 'zod';
import { checkWith, describeValue, type Checked } from './field-errors';
import {
  coinProbabilitySchema,
  FACTOR_ID_PATTERN,
  imbalanceMeasureSchema,
  MAX_BLOCK_SIZE,
  SCHEME_METHODS,
  schemeParametersSchemaByMethod,
  squaresPerBlockSchema,
  type SchemeMethod,
  type SchemeParameters,
} from './scheme-parameters';

/**
 * What a researcher chooses for a scheme (PUT …/assignment-scheme): the method and that method's settings. The api
 * adds the study's conditions and factors to make the full parameters (scheme-parameters.ts).
 */

const wholeBlockSize = (issue: { input?: unknown }) =>
  `must be a whole number of 1 or more (got ${describeValue(issue.input)})`;

const blockSizesSetting = z
  .array(
    z
      .int({ error: wholeBlockSize })
      .min(1, { error: wholeBlockSize })
      .max(MAX_BLOCK_SIZE, {
        error: (issue) => `must be at most ${MAX_BLOCK_SIZE} (got ${describeValue(issue.input)})`,
      }),
    { error: 'must list at least one allowed block size' },
  )
  .min(1, 'must list at least one allowed block size')
  .meta({ description: 'Allowed block sizes, each a multiple of the total weight of the study’s conditions' });

const settingsObject = <Shape extends z.ZodRawShape>(method: SchemeMethod, shape: Shape) =>
  z.strictObject(shape, {
    error: (issue) =>
      issue.code === 'unrecognized_keys' ? `is not a setting of the ${method} scheme` : 'must be an object of settings',
  });

const withinSettings = (method: SchemeMethod) =>
  settingsObject(method, {
    squaresPerBlock: squaresPerBlockSchema.optional(),
    stratify: z
      .boolean({ error: 'must be true or false' })
      .optional()
      .meta({ description: 'Hand out orders separately per stratum of the study’s factors' }),
  });

/** Each method's settings (without `method`). */
export const schemeSettingsSchemaByMethod = {
  simple: settingsObject('simple', {}),
  'permuted-blocks': settingsObject('permuted-blocks', { blockSizes: blockSizesSetting }),
  'stratified-blocks': settingsObject('stratified-blocks', { blockSizes: blockSizesSetting }),
  minimization: settingsObject('minimization', {
    measure: imbalanceMeasureSchema.optional().meta({ description: 'How imbalance is measured; range when left out' }),
    coinProbability: coinProbabilitySchema.optional(),
  }),
  'matched-pairs': settingsObject('matched-pairs', {
    pretestKey: z
      .string({ error: 'must name the numeric pretest factor' })
      .regex(FACTOR_ID_PATTERN, 'must name the numeric pretest factor')
      .optional()
      .meta({ description: 'The numeric pretest factor used to pair people' }),
  }),
  counterbalanced: withinSettings('counterbalanced'),
  'latin-square': withinSettings('latin-square'),
  williams: withinSettings('williams'),
} as const;

export type SchemeSettingsOf<M extends SchemeMethod> = z.output<(typeof schemeSettingsSchemaByMethod)[M]>;

/** Any method's settings: what GET …/assignment returns as `settings` and a dry run may try. */
export const schemeSettingsSchema = z
  .union([
    schemeSettingsSchemaByMethod.simple,
    schemeSettingsSchemaByMethod['permuted-blocks'],
    schemeSettingsSchemaByMethod.minimization,
    schemeSettingsSchemaByMethod['matched-pairs'],
    schemeSettingsSchemaByMethod.counterbalanced,
  ])
  .meta({ id: 'SchemeSettings' });

export type SchemeSettings = z.output<typeof schemeSettingsSchema>;

const methodSchema = z.enum(SCHEME_METHODS, {
  error: (issue) => `must be one of ${SCHEME_METHODS.join(', ')} (got ${describeValue(issue.input)})`,
});

/** PUT …/assignment-scheme: one object per method, holding only that method's settings. */
export const assignmentSchemeRequestSchema = z
  .discriminatedUnion(
    'method',
    SCHEME_METHODS.map((method) => schemeSettingsSchemaByMethod[method].extend({ method: z.literal(method) })) as [
      z.ZodObject<{ method: z.ZodLiteral<'simple'> }>,
      ...z.ZodObject<{ method: z.ZodLiteral<SchemeMethod> }>[],
    ],
  )
  .meta({ id: 'AssignmentSchemeRequest' });

export type AssignmentSchemeRequest = { [M in SchemeMethod]: { method: M } & SchemeSettingsOf<M> }[SchemeMethod];

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Checks a PUT …/assignment-scheme body: the method first, then that method's settings, each error on its field. */
export function checkAssignmentSchemeRequest(input: unknown): Checked<AssignmentSchemeRequest> {
  if (!isRecord(input)) return { ok: false, errors: [{ field: 'body', message: 'must be an object with a method' }] };
  const method = methodSchema.safeParse(input.method);
  if (!method.success) return { ok: false, errors: [{ field: 'method', message: method.error.issues[0]!.message }] };
  const { method: _method, ...settings } = input;
  void _method;
  const checked = checkWith(schemeSettingsSchemaByMethod[method.data], settings, 'body');
  return checked.ok
    ? { ok: true, value: { method: method.data, ...checked.value } as AssignmentSchemeRequest }
    : checked;
}

/** Checks settings for a method already chosen (e.g. a dry run of another scheme). */
export function checkSchemeSettings(method: SchemeMethod, input: unknown, field = 'settings'): Checked<SchemeSettings> {
  const checked = checkWith(schemeSettingsSchemaByMethod[method], input ?? {}, field);
  if (checked.ok) return checked;
  return {
    ok: false,
    errors: checked.errors.map((e) => ({ ...e, field: e.field === field ? field : `${field}.${e.field}` })),
  };
}

/**
 * Checks full scheme parameters (a stored column, or the design and settings combined): the object and method first,
 * then that method's rules, with defaults filled in and unknown fields refused.
 */
export function checkSchemeParameters(input: unknown): Checked<SchemeParameters> {
  if (!isRecord(input))
    return {
      ok: false,
      errors: [{ field: 'parameters', message: 'must be an object with a method and its settings' }],
    };
  const method = methodSchema.safeParse(input.method);
  if (!method.success) return { ok: false, errors: [{ field: 'method', message: method.error.issues[0]!.message }] };
  return checkWith(schemeParametersSchemaByMethod[method.data], input, 'parameters') as Checked<SchemeParameters>;
}
