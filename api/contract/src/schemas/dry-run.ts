import { z } from 'zod';
import { checkSchemeSettings, schemeSettingsSchema } from './assignment';
import { checkWith, type Checked } from './field-errors';
import { SCHEME_METHODS } from './scheme-parameters';

/** A dry run: simulated arrivals through a scheme with a throwaway seed (POST …/assignment/dry-run). */

export const MAX_DRY_RUN_ARRIVALS = 100_000;

const relativeShare = z
  .number({ error: 'must be a number of 0 or more' })
  .nonnegative('must be a number of 0 or more')
  .meta({ description: 'A relative share; the shares need not add up to 1' });

/** How one covariate is spread among simulated arrivals. Proportions and probabilities are relative. */
export const covariateDistributionSchema = z
  .discriminatedUnion(
    'kind',
    [
      z.strictObject({ kind: z.literal('categorical'), proportions: z.record(z.string(), relativeShare) }),
      z.strictObject({
        kind: z.literal('numeric-values'),
        values: z.array(z.strictObject({ value: z.number(), probability: relativeShare })),
      }),
      z.strictObject({ kind: z.literal('normal'), mean: z.number(), sd: z.number() }),
    ],
    { error: 'must be a distribution: categorical, numeric-values or normal' },
  )
  .meta({ id: 'CovariateDistribution' });

export type CovariateDistribution = z.output<typeof covariateDistributionSchema>;

export const dryRunRequestSchema = z
  .strictObject(
    {
      arrivals: z
        .int({ error: `must be a whole number from 1 to ${MAX_DRY_RUN_ARRIVALS}` })
        .min(1, `must be a whole number from 1 to ${MAX_DRY_RUN_ARRIVALS}`)
        .max(MAX_DRY_RUN_ARRIVALS, `must be a whole number from 1 to ${MAX_DRY_RUN_ARRIVALS}`),
      seed: z
        .string({ error: 'seed must be 64 hexadecimal characters' })
        .regex(/^[0-9a-fA-F]{64}$/, 'seed must be 64 hexadecimal characters')
        .optional()
        .meta({
          description: '64 hex characters; a fresh throwaway seed when omitted. Never the study’s sealed seed.',
        }),
      covariateMix: z
        .record(z.string(), covariateDistributionSchema, { error: 'must be an object keyed by covariate id' })
        .optional()
        .meta({
          description:
            'One distribution per covariate the scheme uses, keyed by covariate id; when omitted, the starting mix (GET …/assignment/dry-run/starting-mix)',
        }),
      method: z
        .enum(SCHEME_METHODS, { error: `must be one of ${SCHEME_METHODS.join(', ')}` })
        .optional()
        .meta({ description: 'Try another scheme than the saved one' }),
      settings: schemeSettingsSchema
        .optional()
        .meta({ description: 'Settings for `method`, as in PUT assignment-scheme' }),
    },
    { error: (issue) => (issue.code === 'unrecognized_keys' ? 'is not a dry-run setting' : 'must be an object') },
  )
  .meta({ id: 'DryRunRequest' });

export type DryRunRequest = z.input<typeof dryRunRequestSchema>;

/** Where a dry run's covariate mix starts: the people screened so far, or an even mix before anyone is. */
export const dryRunStartingMixSchema = z
  .object({
    basis: z.enum(['observed', 'even']).meta({
      description: '`observed`: the answers of the people screened so far; `even`: nobody screened yet',
    }),
    people: z.int().meta({ description: 'How many screened people answered at least one stratification question' }),
    mix: z.record(z.string(), covariateDistributionSchema).meta({ description: 'One distribution per factor key' }),
  })
  .meta({ id: 'DryRunStartingMix' });

export type DryRunStartingMix = z.output<typeof dryRunStartingMixSchema>;

const imbalanceSummary = z.object({ overall: z.number(), inStratum: z.number(), inFactorLevel: z.number() });

/** What a dry run reports: the balance reached per arm, stratum and factor level, and over time. */
export const dryRunResultSchema = z
  .object({
    arrivals: z.int(),
    arms: z.array(
      z.object({
        armId: z
          .string()
          .meta({ description: 'The condition id, or "order-1", "order-2", … for within-subjects designs' }),
        label: z.string().meta({ description: 'The condition id, or the order as "A → B → C"' }),
        count: z.int(),
        share: z.number(),
        targetShare: z.number(),
      }),
    ),
    strata: z.array(
      z.object({
        stratumKey: z.string(),
        total: z.int(),
        counts: z.record(z.string(), z.int()),
        imbalance: z.number(),
      }),
    ),
    factorLevels: z.array(
      z.object({
        factorId: z.string(),
        level: z.string(),
        total: z.int(),
        counts: z.record(z.string(), z.int()),
        imbalance: z.number(),
      }),
    ),
    imbalanceOverTime: z
      .array(
        z.object({
          arrivals: z.int(),
          overall: z.number(),
          largestInStratum: z.number(),
          largestInFactorLevel: z.number(),
        }),
      )
      .meta({ description: 'The largest imbalance reached within each sampled stretch of arrivals' }),
    largestImbalance: imbalanceSummary,
    finalImbalance: imbalanceSummary,
    matchedPairs: z.object({ pairs: z.int(), leftoverParticipantId: z.string().nullable() }).nullable(),
    seed: z.string().meta({ description: 'The throwaway seed, to run the same simulation again' }),
  })
  .meta({ id: 'DryRunResult' });

export type DryRunResult = z.output<typeof dryRunResultSchema>;

/** Checks a dry-run body: its own fields, then the settings against the method they are for. */
export function checkDryRunRequest(input: unknown): Checked<DryRunRequest> {
  const loose = dryRunRequestSchema.extend({ settings: z.record(z.string(), z.unknown()).optional() });
  const checked = checkWith(loose, input, 'body');
  if (!checked.ok) return checked;
  const { method, settings } = checked.value;
  if (method === undefined || settings === undefined) return checked as Checked<DryRunRequest>;
  const settingsChecked = checkSchemeSettings(method, settings);
  return settingsChecked.ok
    ? { ok: true, value: { ...checked.value, settings: settingsChecked.value } }
    : settingsChecked;
}
