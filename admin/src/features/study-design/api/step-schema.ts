import { z } from 'zod';
import { formatMinor, parseMajorAmount } from '@/lib/money';

/** The api's ceiling on one amount of pay (`@Max(100_000_000)` on `payMinor` in api/src/steps/dto/step.dto.ts). */
export const MAX_PAY_MINOR = 100_000_000;

/** What is wrong with a typed amount of pay, in the person's currency and words; null when it is fine. */
export function payProblem(text: string, currency: string): string | null {
  const amount = parseMajorAmount(text, currency);
  if (!amount.ok) return amount.message;
  if (amount.minor > MAX_PAY_MINOR) return `Pay per step: at most ${formatMinor(MAX_PAY_MINOR, currency)}.`;
  return null;
}

/** The api's field messages about `payMinor`, said as money in the study's currency. */
export function plainPayMessage(message: string, currency: string): string {
  const ceiling = /must not be greater than (\d+)/.exec(message);
  if (ceiling) return `Pay per step: at most ${formatMinor(Number(ceiling[1]), currency)}.`;
  if (/must not be less than|negative/.test(message)) return 'Enter an amount above zero.';
  if (/whole number of minor units/.test(message)) return 'Enter an amount in numbers, like 15 or 15.50.';
  return message;
}

/** Rewrites an api refusal's `payMinor` messages in place before they are put on the form. */
export function withPlainPayMessages(error: unknown, currency: string): unknown {
  if (error instanceof Error && 'fieldErrors' in error && Array.isArray(error.fieldErrors)) {
    for (const fieldError of error.fieldErrors as Array<{ field: string; message: string }>) {
      if (fieldError.field === 'payMinor') fieldError.message = plainPayMessage(fieldError.message, currency);
    }
  }
  return error;
}

/** Step title, description and pay typed in major units; the currency decides how many decimals are allowed. */
export function stepInputSchema(currency: string) {
  return z
    .object({
      title: z.string().trim().min(1, 'Enter a title for the step.').max(200, 'Keep the title under 200 characters.'),
      description: z.string().max(4000, 'Keep the description under 4,000 characters.'),
      pay: z.string(),
      position: z.string().trim(),
    })
    .superRefine((values, ctx) => {
      const problem = payProblem(values.pay, currency);
      if (problem) ctx.addIssue({ code: 'custom', path: ['pay'], message: problem });
      if (values.position !== '' && !(/^\d+$/.test(values.position) && Number(values.position) >= 1)) {
        ctx.addIssue({
          code: 'custom',
          path: ['position'],
          message: 'Enter a place from 1, or leave it empty to add the step last.',
        });
      }
    })
    .transform((values) => ({
      title: values.title,
      description: values.description,
      payMinor: (parseMajorAmount(values.pay, currency) as { minor: number }).minor,
      position: values.position === '' ? undefined : Number(values.position),
    }));
}

export type StepFormValues = z.input<ReturnType<typeof stepInputSchema>>;
export type StepFormOutput = z.output<ReturnType<typeof stepInputSchema>>;

export function payOverrideInputSchema(currency: string) {
  return z
    .object({
      conditionId: z
        .string({ error: 'Choose the condition that is paid differently.' })
        .min(1, 'Choose the condition that is paid differently.'),
      pay: z.string(),
      reason: z
        .string()
        .trim()
        .min(10, 'Explain the exception in at least 10 characters; it is kept in the record.')
        .max(1000, 'Keep the reason under 1,000 characters.'),
    })
    .superRefine((values, ctx) => {
      const problem = payProblem(values.pay, currency);
      if (problem) ctx.addIssue({ code: 'custom', path: ['pay'], message: problem });
    })
    .transform((values) => ({
      conditionId: values.conditionId,
      reason: values.reason,
      payMinor: (parseMajorAmount(values.pay, currency) as { minor: number }).minor,
    }));
}

export type PayOverrideFormValues = z.input<ReturnType<typeof payOverrideInputSchema>>;
export type PayOverrideFormOutput = z.output<ReturnType<typeof payOverrideInputSchema>>;
