import { z } from 'zod';
import { parseLines, parseNumberList } from '@/lib/number-list';
import { cutPointProblem } from '../utils/factor-levels';
import type { StratificationFactorInput } from './replace-stratification-factors';

const factorRowSchema = z.object({
  key: z
    .string()
    .trim()
    .regex(
      /^[a-z][a-z0-9_]{0,63}$/,
      'Start with a letter; use lower-case letters, digits and _ (like sense_of_direction), at most 64.',
    ),
  label: z
    .string()
    .trim()
    .min(1, 'Enter the question participants answer.')
    .max(300, 'Keep the question under 300 characters.'),
  kind: z.enum(['numeric', 'categorical']),
  cutPoints: z.string(),
  categories: z.string(),
  minimizationWeight: z.string().trim(),
});

export type FactorRowValues = z.infer<typeof factorRowSchema>;

// The api's rules (api/src/studies/stratification-factor-rules.ts), checked here so each problem shows on its row.
export const factorsFormSchema = z
  .object({
    factors: z
      .array(factorRowSchema)
      .max(8, 'Use at most 8 factors; every extra factor multiplies the number of strata.'),
  })
  .superRefine(({ factors }, ctx) => {
    const keys = new Set<string>();
    factors.forEach((factor, i) => {
      if (keys.has(factor.key))
        ctx.addIssue({
          code: 'custom',
          path: ['factors', i, 'key'],
          message: `“${factor.key}” is used by another factor.`,
        });
      keys.add(factor.key);
      if (factor.kind === 'numeric') {
        const cuts = parseNumberList(factor.cutPoints);
        const problem = cuts.ok ? cutPointProblem(cuts.values) : cuts.message;
        if (problem) ctx.addIssue({ code: 'custom', path: ['factors', i, 'cutPoints'], message: problem });
        else if (cuts.ok && cuts.values.length > 20)
          ctx.addIssue({ code: 'custom', path: ['factors', i, 'cutPoints'], message: 'Use at most 20 cut points.' });
      } else {
        const categories = parseLines(factor.categories);
        if (categories.length < 2)
          ctx.addIssue({
            code: 'custom',
            path: ['factors', i, 'categories'],
            message: 'List at least two categories, one per line.',
          });
        else if (new Set(categories).size !== categories.length)
          ctx.addIssue({ code: 'custom', path: ['factors', i, 'categories'], message: 'A category is listed twice.' });
        else if (categories.some((c) => c.includes('|')))
          ctx.addIssue({
            code: 'custom',
            path: ['factors', i, 'categories'],
            message: 'Categories cannot contain “|”.',
          });
      }
      const weight = Number(factor.minimizationWeight);
      if (factor.minimizationWeight === '' || !Number.isFinite(weight) || weight < 0.01 || weight > 100) {
        ctx.addIssue({
          code: 'custom',
          path: ['factors', i, 'minimizationWeight'],
          message: 'Enter a weight from 0.01 to 100 (1 is usual).',
        });
      }
    });
  })
  .transform(({ factors }): StratificationFactorInput[] =>
    factors.map((factor) => ({
      key: factor.key,
      label: factor.label,
      kind: factor.kind,
      minimizationWeight: Number(factor.minimizationWeight),
      ...(factor.kind === 'numeric'
        ? { cutPoints: (parseNumberList(factor.cutPoints) as { values: number[] }).values }
        : { categories: parseLines(factor.categories) }),
    })),
  );

export type FactorsFormValues = z.input<typeof factorsFormSchema>;

export const emptyFactorRow: FactorRowValues = {
  key: '',
  label: '',
  kind: 'numeric',
  cutPoints: '',
  categories: '',
  minimizationWeight: '1',
};
