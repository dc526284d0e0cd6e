import { z } from 'zod';
import { parseLines } from '@/lib/number-list';
import type { ScreeningQuestionInput } from './replace-screening-questions';

const questionRowSchema = z.object({
  key: z
    .string()
    .trim()
    .regex(
      /^[a-z][a-z0-9_]{0,63}$/,
      'Start with a letter; use lower-case letters, digits and _ (like adult), at most 64.',
    ),
  label: z.string().trim().min(1, 'Enter the question.').max(300, 'Keep the question under 300 characters.'),
  kind: z.enum(['yes-no', 'number', 'choice']),
  options: z.string(),
  minValue: z.string().trim(),
  maxValue: z.string().trim(),
  help: z.string().max(500, 'Keep the help text under 500 characters.'),
  criterion: z.string().trim().max(200, 'Keep the rule under 200 characters.'),
  eligibleAnswer: z.enum(['yes', 'no', 'any']),
  eligibleMin: z.string().trim(),
  eligibleMax: z.string().trim(),
  eligibleOptions: z.array(z.string()),
});

export type ScreeningRowValues = z.infer<typeof questionRowSchema>;

const isNumberText = (text: string) => text !== '' && Number.isFinite(Number(text));
const optionalNumber = (text: string) => (text === '' ? undefined : Number(text));

// The api's rules (api/src/studies/stratification-factor-rules.ts, checkScreeningQuestions), per row.
export function screeningFormSchema(factorKeys: readonly string[]) {
  return z
    .object({ questions: z.array(questionRowSchema).max(30, 'Use at most 30 questions.') })
    .superRefine(({ questions }, ctx) => {
      const keys = new Set<string>();
      questions.forEach((question, i) => {
        const at = (field: keyof ScreeningRowValues) => ['questions', i, field];
        if (keys.has(question.key))
          ctx.addIssue({ code: 'custom', path: at('key'), message: `“${question.key}” is used by another question.` });
        if (factorKeys.includes(question.key))
          ctx.addIssue({
            code: 'custom',
            path: at('key'),
            message: `“${question.key}” is already a stratification factor.`,
          });
        keys.add(question.key);
        for (const field of ['minValue', 'maxValue', 'eligibleMin', 'eligibleMax'] as const) {
          if (question.kind === 'number' && question[field] !== '' && !isNumberText(question[field])) {
            ctx.addIssue({ code: 'custom', path: at(field), message: 'Enter a number, or leave it empty.' });
          }
        }
        if (question.kind === 'number') {
          if (
            isNumberText(question.minValue) &&
            isNumberText(question.maxValue) &&
            Number(question.minValue) > Number(question.maxValue)
          ) {
            ctx.addIssue({
              code: 'custom',
              path: at('maxValue'),
              message: 'The highest answer cannot be below the lowest.',
            });
          }
          if (
            isNumberText(question.eligibleMin) &&
            isNumberText(question.eligibleMax) &&
            Number(question.eligibleMin) > Number(question.eligibleMax)
          ) {
            ctx.addIssue({
              code: 'custom',
              path: at('eligibleMax'),
              message: 'The upper limit cannot be below the lower one.',
            });
          }
        }
        if (question.kind === 'choice') {
          const options = parseLines(question.options);
          if (options.length < 2)
            ctx.addIssue({ code: 'custom', path: at('options'), message: 'List at least two options, one per line.' });
          else if (new Set(options).size !== options.length)
            ctx.addIssue({ code: 'custom', path: at('options'), message: 'An option is listed twice.' });
        }
      });
    })
    .transform(({ questions }): ScreeningQuestionInput[] =>
      questions.map((question) => {
        const base: ScreeningQuestionInput = {
          key: question.key,
          label: question.label,
          kind: question.kind,
          ...(question.help.trim() ? { help: question.help.trim() } : {}),
          ...(question.criterion ? { criterion: question.criterion } : {}),
        };
        if (question.kind === 'yes-no') {
          return question.eligibleAnswer === 'any'
            ? base
            : { ...base, eligibleValues: [question.eligibleAnswer === 'yes'] };
        }
        if (question.kind === 'number') {
          const range = {
            minValue: optionalNumber(question.minValue),
            maxValue: optionalNumber(question.maxValue),
            eligibleMin: optionalNumber(question.eligibleMin),
            eligibleMax: optionalNumber(question.eligibleMax),
          };
          return { ...base, ...Object.fromEntries(Object.entries(range).filter(([, value]) => value !== undefined)) };
        }
        const options = parseLines(question.options);
        const eligible = question.eligibleOptions.filter((option) => options.includes(option));
        return { ...base, options, ...(eligible.length > 0 ? { eligibleValues: eligible } : {}) };
      }),
    );
}

export type ScreeningFormValues = z.input<ReturnType<typeof screeningFormSchema>>;

export const emptyScreeningRow: ScreeningRowValues = {
  key: '',
  label: '',
  kind: 'yes-no',
  options: '',
  minValue: '',
  maxValue: '',
  help: '',
  criterion: '',
  eligibleAnswer: 'yes',
  eligibleMin: '',
  eligibleMax: '',
  eligibleOptions: [],
};
