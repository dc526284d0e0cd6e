import { describe, expect, it } from 'vitest';
import { checkCreateConsentDraftRequest, checkRefillConsentDraftRequest } from './consent-values';

const values = {
  institutionName: 'Northfield Institute',
  investigatorName: 'Dr. Imogen Vale',
  contactEmail: 'vale@example.org',
  paymentDays: 14,
  dataRetentionYears: 5,
  futureUseDeidentified: false,
};

describe('checkCreateConsentDraftRequest', () => {
  it('accepts a template with values, or with none', () => {
    expect(checkCreateConsentDraftRequest({ templateId: 'consent/minimal-risk-paid-study', values })).toEqual({
      ok: true,
      value: { templateId: 'consent/minimal-risk-paid-study', values },
    });
    expect(checkCreateConsentDraftRequest({ templateId: 'consent/minimal-risk-paid-study' }).ok).toBe(true);
  });

  it('refuses a missing template and an unknown field, naming each', () => {
    expect(checkCreateConsentDraftRequest({ values })).toEqual({
      ok: false,
      errors: [{ field: 'templateId', message: 'templateId must name a template' }],
    });
    expect(checkCreateConsentDraftRequest({ templateId: 'consent/x', draft: true })).toEqual({
      ok: false,
      errors: [{ field: 'draft', message: 'draft is not an allowed field' }],
    });
  });

  it('refuses each kind of bad value by its field in values', () => {
    const withValues = (changed: Record<string, unknown>) =>
      checkCreateConsentDraftRequest({ templateId: 'consent/x', values: { ...values, ...changed } });
    expect(withValues({ contactEmail: 'not an address' })).toEqual({
      ok: false,
      errors: [{ field: 'values.contactEmail', message: 'values.contactEmail must be an e-mail address' }],
    });
    expect(withValues({ institutionName: 'x'.repeat(201) })).toEqual({
      ok: false,
      errors: [{ field: 'values.institutionName', message: 'values.institutionName must be at most 200 characters' }],
    });
    expect(withValues({ investigatorName: 7 })).toEqual({
      ok: false,
      errors: [{ field: 'values.investigatorName', message: 'values.investigatorName must be text' }],
    });
    expect(withValues({ paymentDays: 0 })).toEqual({
      ok: false,
      errors: [{ field: 'values.paymentDays', message: 'values.paymentDays must be 1 or more' }],
    });
    expect(withValues({ dataRetentionYears: 2.5 })).toEqual({
      ok: false,
      errors: [{ field: 'values.dataRetentionYears', message: 'values.dataRetentionYears must be a whole number' }],
    });
    expect(withValues({ futureUseDeidentified: 'no' })).toEqual({
      ok: false,
      errors: [
        { field: 'values.futureUseDeidentified', message: 'values.futureUseDeidentified must be true or false' },
      ],
    });
    expect(withValues({ signedBy: 'Someone' })).toEqual({
      ok: false,
      errors: [{ field: 'values.signedBy', message: 'values.signedBy is not an allowed field' }],
    });
  });
});

describe('checkRefillConsentDraftRequest', () => {
  it('accepts values, even empty ones', () => {
    expect(checkRefillConsentDraftRequest({ values })).toEqual({ ok: true, value: { values } });
    expect(checkRefillConsentDraftRequest({ values: {} })).toEqual({ ok: true, value: { values: {} } });
  });

  it('refuses a body without values and a template change, naming the field', () => {
    expect(checkRefillConsentDraftRequest({})).toEqual({
      ok: false,
      errors: [{ field: 'values', message: 'values must be an object' }],
    });
    expect(checkRefillConsentDraftRequest({ values, templateId: 'consent/x' })).toEqual({
      ok: false,
      errors: [{ field: 'templateId', message: 'templateId is not an allowed field' }],
    });
  });
});
