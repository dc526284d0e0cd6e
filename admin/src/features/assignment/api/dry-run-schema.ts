import { z } from 'zod';
import {
  checkSchemeSettings,
  toSchemeSettings,
  type SchemeContext,
  type SchemeFormValues,
} from '../utils/scheme-settings';
import type { DryRunStartingMix } from './get-starting-mix';
import type { CovariateDistribution, DryRunRequest } from './run-dry-run';
import { schemeFormFields } from './save-assignment-scheme';

/** A stratification factor as the dry run needs it: what kind of values to simulate. */
export interface DryRunFactor {
  key: string;
  kind: 'numeric' | 'categorical';
  cutPoints: number[] | null;
  categories: string[] | null;
}

export const maxDryRunArrivals = 100_000;

const mixRowSchema = z.object({ mean: z.string(), sd: z.string(), shares: z.array(z.string()) });

const isNumber = (text: string) => text.trim() !== '' && Number.isFinite(Number(text));

/**
 * The dry-run form: arrivals, an optional seed, the covariate mix per factor and, when comparing, another scheme
 * with its settings (checked as in the scheme form).
 */
export function dryRunFormSchema(factors: readonly DryRunFactor[], context: SchemeContext, hasSavedScheme: boolean) {
  return z
    .object({
      arrivals: z.string().trim(),
      seed: z.string().trim(),
      compare: z.boolean(),
      mix: z.array(mixRowSchema),
      ...schemeFormFields,
    })
    .superRefine((values, ctx) => {
      const arrivals = values.arrivals.replace(/[,\s]/g, '');
      if (!/^\d+$/.test(arrivals) || Number(arrivals) < 1 || Number(arrivals) > maxDryRunArrivals) {
        ctx.addIssue({
          code: 'custom',
          path: ['arrivals'],
          message: `Enter a whole number of arrivals from 1 to ${maxDryRunArrivals.toLocaleString('en')}.`,
        });
      }
      if (values.seed !== '' && !/^[0-9a-fA-F]{64}$/.test(values.seed)) {
        ctx.addIssue({
          code: 'custom',
          path: ['seed'],
          message: 'A seed is 64 hexadecimal characters; leave it empty for a fresh one.',
        });
      }
      factors.forEach((factor, i) => {
        const row = values.mix[i];
        if (!row) return;
        if (factor.kind === 'numeric') {
          if (!isNumber(row.mean))
            ctx.addIssue({ code: 'custom', path: ['mix', i, 'mean'], message: 'Enter the average score.' });
          if (!isNumber(row.sd) || Number(row.sd) < 0)
            ctx.addIssue({ code: 'custom', path: ['mix', i, 'sd'], message: 'Enter a spread of 0 or more.' });
        } else {
          row.shares.forEach((share, j) => {
            if (!isNumber(share) || Number(share) < 0)
              ctx.addIssue({ code: 'custom', path: ['mix', i, 'shares', j], message: 'Enter a share of 0 or more.' });
          });
          if (row.shares.every((share) => !isNumber(share) || Number(share) <= 0)) {
            ctx.addIssue({
              code: 'custom',
              path: ['mix', i, 'shares', 0],
              message: 'Give at least one category a share above 0.',
            });
          }
        }
      });
      if (values.compare || !hasSavedScheme) {
        for (const issue of checkSchemeSettings(values, context))
          ctx.addIssue({ code: 'custom', path: [issue.path], message: issue.message });
      }
    })
    .transform((values): DryRunRequest => {
      const covariateMix: Record<string, CovariateDistribution> = {};
      factors.forEach((factor, i) => {
        const row = values.mix[i] as z.infer<typeof mixRowSchema>;
        covariateMix[factor.key] =
          factor.kind === 'numeric'
            ? { kind: 'normal', mean: Number(row.mean), sd: Number(row.sd) }
            : {
                kind: 'categorical',
                proportions: Object.fromEntries(
                  (factor.categories ?? []).map((category, j) => [category, Number(row.shares[j] ?? 0)]),
                ),
              };
      });
      const comparing = values.compare || !hasSavedScheme;
      return {
        arrivals: Number(values.arrivals.replace(/[,\s]/g, '')),
        covariateMix,
        ...(values.seed ? { seed: values.seed.toLowerCase() } : {}),
        ...(comparing && values.method
          ? { method: values.method, settings: toSchemeSettings(values as SchemeFormValues) }
          : {}),
      };
    });
}

export type DryRunFormValues = z.input<ReturnType<typeof dryRunFormSchema>>;

/** A starting mix: numeric scores spread around the cut points, categories in equal shares. */
export function defaultMix(factors: readonly DryRunFactor[]): DryRunFormValues['mix'] {
  return factors.map((factor) => {
    if (factor.kind === 'categorical') return { mean: '', sd: '', shares: (factor.categories ?? []).map(() => '1') };
    const cuts = factor.cutPoints ?? [];
    const mean = cuts.length > 0 ? cuts.reduce((a, b) => a + b, 0) / cuts.length : 0;
    const spread = cuts.length > 1 ? (cuts[cuts.length - 1] as number) - (cuts[0] as number) : Math.abs(mean) * 0.3;
    return { mean: String(Math.round(mean * 100) / 100), sd: String(Math.max(1, Math.round(spread))), shares: [] };
  });
}

/** The form's rows from the api's starting mix; a factor it does not cover starts from `defaultMix`. */
export function mixFromStartingMix(
  factors: readonly DryRunFactor[],
  starting: DryRunStartingMix,
): DryRunFormValues['mix'] {
  const fallback = defaultMix(factors);
  return factors.map((factor, i) => {
    const distribution = starting.mix[factor.key];
    if (factor.kind === 'numeric' && distribution?.kind === 'normal')
      return { mean: String(distribution.mean), sd: String(distribution.sd), shares: [] };
    if (factor.kind === 'categorical' && distribution?.kind === 'categorical')
      return {
        mean: '',
        sd: '',
        shares: (factor.categories ?? []).map((category) => String(distribution.proportions[category] ?? 0)),
      };
    return fallback[i] as DryRunFormValues['mix'][number];
  });
}

/** Says on screen where the mix came from. */
export function startingMixSentence(starting: DryRunStartingMix): string {
  return starting.basis === 'observed'
    ? `Using the mix of the ${starting.people.toLocaleString('en')} ${starting.people === 1 ? 'person' : 'people'} screened so far. Change it to try another.`
    : 'No one screened yet: using an even mix (equal shares of each category, scores centred on the cut points).';
}
