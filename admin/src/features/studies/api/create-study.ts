import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { isKnownCurrency, parseMajorAmount } from '@/lib/money';
import { studiesKey } from './get-studies';
import type { Study } from './get-study';

export type CreateStudyBody = components['schemas']['CreateStudyDto'];

const optionalText = (max: number, label: string) =>
  z.string().trim().max(max, `Keep the ${label} under ${max} characters.`);

/** An optional whole number typed into a text box; empty means "not set". */
const optionalWholeNumber = (min: number, max: number, label: string) =>
  z
    .string()
    .trim()
    .refine((text) => text === '' || (/^\d+$/.test(text) && Number(text) >= min && Number(text) <= max), {
      message: `Enter the ${label} as a whole number from ${min.toLocaleString('en')} to ${max.toLocaleString('en')}, or leave it empty.`,
    })
    .transform((text) => (text === '' ? undefined : Number(text)));

// The same rules as the api's CreateStudyDto (api/src/studies/dto/study.dto.ts), so mistakes show before sending.
export const createStudyInputSchema = z
  .object({
    title: z.string().trim().min(1, 'Enter a title.').max(200, 'Keep the title under 200 characters.'),
    slug: z
      .string()
      .trim()
      .min(3, 'Use 3 to 60 characters for the link name.')
      .max(60, 'Use 3 to 60 characters for the link name.')
      .regex(
        /^[a-z0-9]+(-[a-z0-9]+)*$/,
        'Use lower-case letters and digits, with single dashes between words (like wayfinding-cues).',
      ),
    protocolNumber: optionalText(80, 'protocol number'),
    design: z.enum(['between', 'within'], { error: 'Choose how conditions are compared.' }),
    summary: optionalText(4000, 'summary'),
    estimatedMinutes: optionalWholeNumber(1, 10_000, 'estimated time'),
    targetSize: optionalWholeNumber(1, 1_000_000, 'target size'),
    budget: z.string().trim(),
    currency: z
      .string()
      .trim()
      .transform((text) => text.toUpperCase())
      .refine(isKnownCurrency, 'Enter a three-letter currency code such as USD or EUR.'),
    blinded: z.boolean(),
    labName: optionalText(200, 'lab name'),
    contactEmail: z
      .string()
      .trim()
      .refine(
        (text) => text === '' || z.email().safeParse(text).success,
        'Enter a valid e-mail address, like study-team@lab.org.',
      ),
  })
  .superRefine((values, ctx) => {
    if (values.budget === '' || !isKnownCurrency(values.currency)) return;
    const amount = parseMajorAmount(values.budget, values.currency);
    if (!amount.ok) ctx.addIssue({ code: 'custom', path: ['budget'], message: amount.message });
  })
  .transform((values): CreateStudyBody => {
    const budget = values.budget === '' ? null : parseMajorAmount(values.budget, values.currency);
    return {
      slug: values.slug,
      title: values.title,
      design: values.design,
      currency: values.currency,
      blinded: values.blinded,
      ...(values.protocolNumber ? { protocolNumber: values.protocolNumber } : {}),
      ...(values.summary ? { summary: values.summary } : {}),
      ...(values.estimatedMinutes !== undefined ? { estimatedMinutes: values.estimatedMinutes } : {}),
      ...(values.targetSize !== undefined ? { targetSize: values.targetSize } : {}),
      ...(budget?.ok ? { budgetMinor: budget.minor } : {}),
      ...(values.labName ? { labName: values.labName } : {}),
      ...(values.contactEmail ? { contactEmail: values.contactEmail } : {}),
    };
  });

export type CreateStudyFormValues = z.input<typeof createStudyInputSchema>;

export async function createStudy(body: CreateStudyBody): Promise<Study> {
  return unwrap(apiClient.POST('/api/studies', { body }));
}

export function useCreateStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createStudy,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: studiesKey, exact: true }),
  });
}

/** A link name suggested from the title: "Wayfinding cues (pilot)" → "wayfinding-cues-pilot". */
export function suggestSlug(title: string): string {
  return title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
}
