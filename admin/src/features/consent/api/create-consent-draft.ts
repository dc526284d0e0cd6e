import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { ConsentTemplateValues as ContractConsentTemplateValues } from '@evenhand/contract';
import { consentVersionsKey, type ConsentVersion } from './get-consent-versions';

export type ConsentTemplateValues = ContractConsentTemplateValues;

const optionalText = (max: number, label: string) =>
  z.string().trim().max(max, `Keep ${label} under ${max} characters.`);

const optionalWholeNumber = (label: string) =>
  z
    .string()
    .trim()
    .refine((value) => value === '' || /^\d+$/.test(value), `Enter ${label} as a whole number, or leave it blank.`)
    .refine(
      (value) => value === '' || Number(value) >= 1,
      `${label[0]?.toUpperCase()}${label.slice(1)} must be at least 1.`,
    );

// Limits mirror ConsentFieldsDto in api/src/consent/dto/consent.dto.ts; shared with filling a draft in again.
export const consentValuesInputSchema = z.object({
  institutionName: optionalText(200, 'the institution'),
  investigatorName: optionalText(200, 'the investigator’s name'),
  contactEmail: z
    .string()
    .trim()
    .refine(
      (value) => value === '' || z.email().safeParse(value).success,
      'Enter a valid e-mail address, like study@lab.org, or leave it blank.',
    ),
  contactPhone: optionalText(60, 'the telephone number'),
  ethicsBoardName: optionalText(200, 'the ethics board’s name'),
  ethicsBoardContact: optionalText(300, 'the ethics board’s contact'),
  studyPurpose: optionalText(1000, 'the purpose'),
  paymentMethod: optionalText(200, 'the payment method'),
  paymentDays: optionalWholeNumber('the days until payment'),
  dataRetentionYears: optionalWholeNumber('the years records are kept'),
  futureUseDeidentified: z.boolean(),
});

export type ConsentValuesInput = z.infer<typeof consentValuesInputSchema>;
export type ConsentValueField = keyof ConsentValuesInput;

export const newConsentDraftInputSchema = consentValuesInputSchema.extend({
  templateId: z.string().min(1, 'Choose a template.'),
});

export type NewConsentDraftInput = z.infer<typeof newConsentDraftInputSchema>;

const textValueFields = [
  'institutionName',
  'investigatorName',
  'contactEmail',
  'contactPhone',
  'ethicsBoardName',
  'ethicsBoardContact',
  'studyPurpose',
  'paymentMethod',
] as const;

/** The form's starting point from stored template values (a blank form when there are none). */
export function consentValuesInput(stored: ConsentTemplateValues = {}): ConsentValuesInput {
  const input = {} as ConsentValuesInput;
  for (const field of textValueFields) input[field] = stored[field] ?? '';
  input.paymentDays = stored.paymentDays === undefined ? '' : String(stored.paymentDays);
  input.dataRetentionYears = stored.dataRetentionYears === undefined ? '' : String(stored.dataRetentionYears);
  input.futureUseDeidentified = stored.futureUseDeidentified ?? false;
  return input;
}

export const emptyConsentDraftInput = (templateId: string): NewConsentDraftInput => ({
  templateId,
  ...consentValuesInput(),
});

/** The template values to send: blanks are left out so the api fills them from the study or marks them "to fill". */
export function templateValuesFrom(input: ConsentValuesInput): ConsentTemplateValues {
  const values: ConsentTemplateValues = { futureUseDeidentified: input.futureUseDeidentified };
  for (const field of textValueFields) {
    const value = input[field].trim();
    if (value) values[field] = value;
  }
  if (input.paymentDays.trim()) values.paymentDays = Number(input.paymentDays);
  if (input.dataRetentionYears.trim()) values.dataRetentionYears = Number(input.dataRetentionYears);
  return values;
}

export async function createConsentDraft(studyId: string, input: NewConsentDraftInput): Promise<ConsentVersion> {
  const created = await unwrap(
    apiClient.POST('/api/studies/{studyId}/consent-versions', {
      params: { path: { studyId } },
      body: { templateId: input.templateId, values: templateValuesFrom(input) },
    }),
  );
  return created as ConsentVersion;
}

export function useCreateConsentDraft(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: NewConsentDraftInput) => createConsentDraft(studyId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: consentVersionsKey(studyId) }),
  });
}
