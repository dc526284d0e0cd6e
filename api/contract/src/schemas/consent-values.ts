import { z } from 'zod';
import { checkWith, type Checked } from './field-errors';

/**
 * The values a consent template is filled in with (creating a draft, filling one in again). Every field may be left
 * out: the study's own fields fill the rest, or the text marks it "to fill".
 */

const notAllowed = {
  error: (issue: { code?: string }) =>
    issue.code === 'unrecognized_keys' ? '{field} is not an allowed field' : '{field} must be an object',
};

const text = (max: number) =>
  z.string({ error: '{field} must be text' }).max(max, `{field} must be at most ${max} characters`).optional();

const wholeNumber = z.int({ error: '{field} must be a whole number' }).min(1, '{field} must be 1 or more').optional();

export const consentTemplateValuesSchema = z
  .strictObject(
    {
      institutionName: text(200),
      investigatorName: text(200),
      contactEmail: z.email({ error: '{field} must be an e-mail address' }).optional(),
      contactPhone: text(60),
      ethicsBoardName: text(200),
      ethicsBoardContact: text(300),
      studyPurpose: text(1000),
      paymentMethod: text(200),
      paymentDays: wholeNumber,
      dataRetentionYears: wholeNumber,
      futureUseDeidentified: z
        .boolean({ error: '{field} must be true or false' })
        .optional()
        .meta({ description: '(b)(9): whether de-identified data may be used in future research' }),
    },
    notAllowed,
  )
  .meta({ id: 'ConsentTemplateValues' });

export type ConsentTemplateValues = z.output<typeof consentTemplateValuesSchema>;

/** POST …/consent-versions: a draft from a template, with values for it. */
export const createConsentDraftRequestSchema = z
  .strictObject(
    {
      templateId: z.string({ error: '{field} must name a template' }).min(1, '{field} must name a template'),
      values: consentTemplateValuesSchema.optional(),
    },
    notAllowed,
  )
  .meta({ id: 'CreateConsentDraftRequest' });

/** POST …/consent-versions/{id}/refill: the values to fill in, replacing the stored ones. */
export const refillConsentDraftRequestSchema = z
  .strictObject({ values: consentTemplateValuesSchema }, notAllowed)
  .meta({ id: 'RefillConsentDraftRequest' });

export type CreateConsentDraftRequest = z.output<typeof createConsentDraftRequestSchema>;
export type RefillConsentDraftRequest = z.output<typeof refillConsentDraftRequestSchema>;

export function checkCreateConsentDraftRequest(input: unknown): Checked<CreateConsentDraftRequest> {
  return checkWith(createConsentDraftRequestSchema, input, 'body');
}

export function checkRefillConsentDraftRequest(input: unknown): Checked<RefillConsentDraftRequest> {
  return checkWith(refillConsentDraftRequestSchema, input, 'body');
}
