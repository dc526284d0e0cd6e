import { z } from 'zod';
import { parseMajorAmount } from '@/lib/money';

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
      const amount = parseMajorAmount(values.pay, currency);
      if (!amount.ok) ctx.addIssue({ code: 'custom', path: ['pay'], message: amount.message });
      if (values.position !== '' && !(/^\d+$/.test(values.position) && Number(values.position) >= 1)) {
        ctx.addIssue({ code: 'custom', path: ['position'], message: 'Enter a place from 1, or leave it empty to add the step last.' });
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
      conditionId: z.string({ error: 'Choose the condition that is paid differently.' }).min(1, 'Choose the condition that is paid differently.'),
      pay: z.string(),
      reason: z.string().trim().min(10, 'Explain the exception in at least 10 characters; it is kept in the record.').max(1000, 'Keep the reason under 1,000 characters.'),
    })
    .superRefine((values, ctx) => {
      const amount = parseMajorAmount(values.pay, currency);
      if (!amount.ok) ctx.addIssue({ code: 'custom', path: ['pay'], message: amount.message });
    })
    .transform((values) => ({
      conditionId: values.conditionId,
      reason: values.reason,
      payMinor: (parseMajorAmount(values.pay, currency) as { minor: number }).minor,
    }));
}

export type PayOverrideFormValues = z.input<ReturnType<typeof payOverrideInputSchema>>;
export type PayOverrideFormOutput = z.output<ReturnType<typeof payOverrideInputSchema>>;
