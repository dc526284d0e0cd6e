import { describe, expect, it } from 'vitest';
import { consentChangeParagraph, summarizeConsentChanges } from './consent-changes';
import { wayfindingConsentFields } from './consent-fields.fixture';
import { fillConsentTemplate, type ConsentTemplateFields } from './consent-template';

/** A version as the service stores it: the values staff gave, and the body the template made of them. */
function version(fields: ConsentTemplateFields, given: Record<string, unknown> = {}) {
  return { templateValues: given, body: fillConsentTemplate(fields) };
}

describe('summarizeConsentChanges', () => {
  const given = { paymentDays: 7, dataRetentionYears: 5 };
  const signed = version(wayfindingConsentFields, given);

  it('finds nothing between a version and itself', () => {
    expect(summarizeConsentChanges(signed, signed)).toEqual([]);
  });

  it('names a step’s new pay once, in money, without calling the pay sections reworded', () => {
    const steps = wayfindingConsentFields.steps.map((step, i) => (i === 0 ? { ...step, payMinor: 1200 } : step));
    const current = version({ ...wayfindingConsentFields, steps }, { paymentDays: 7, dataRetentionYears: 5 });
    expect(summarizeConsentChanges(signed, current)).toEqual([
      'Pay for “Session 1: practice town” changed from $10.00 to $12.00.',
    ]);
  });

  it('says in plain words what the changed values mean to the participant', () => {
    const current = version(
      { ...wayfindingConsentFields, paymentDays: 14, dataRetentionYears: 10, futureUseDeidentified: false },
      { paymentDays: 14, dataRetentionYears: 10, futureUseDeidentified: false },
    );
    const changes = summarizeConsentChanges(
      version(wayfindingConsentFields, { paymentDays: 7, dataRetentionYears: 5, futureUseDeidentified: true }),
      current,
    );
    expect(changes.slice(0, 3)).toEqual([
      'Payment is now sent within 14 days of a confirmed step (it was 7 days).',
      'Your records are now kept for 10 years after the study ends (it was 5 years).',
      'Your information will no longer be used in future research.',
    ]);
  });

  it('lists a new step with its pay and a removed one by title', () => {
    const steps = [
      ...wayfindingConsentFields.steps.slice(0, 2),
      { title: 'Debrief call', payMinor: 800, estimatedMinutes: 15 },
    ];
    const changes = summarizeConsentChanges(signed, version({ ...wayfindingConsentFields, steps }, given));
    expect(changes).toContain('New step: “Debrief call”, paying $8.00.');
    expect(changes).toContain('Step removed: “Follow-up questionnaire”.');
  });

  it('names a section added by hand, one taken out and one reworded', () => {
    const body = signed.body
      .replace(/## Possible benefits[\s\S]*?(?=## )/, '')
      .replace('you can take a break between steps', 'you can take a break of any length between steps')
      .concat('\n## Sharing results with you\n\nWe send everyone a one-page summary of what we found.\n');
    const changes = summarizeConsentChanges(signed, { templateValues: signed.templateValues, body });
    expect(changes).toEqual([
      'Reworded: “Possible risks and discomforts”.',
      'New section: “Sharing results with you”.',
      'Section removed: “Possible benefits”.',
    ]);
  });

  it('reports a renamed step as renamed, not as removed and added', () => {
    const steps = wayfindingConsentFields.steps.map((step, i) =>
      i === 2 ? { ...step, title: 'Closing questionnaire' } : step,
    );
    expect(summarizeConsentChanges(signed, version({ ...wayfindingConsentFields, steps }, given))).toEqual([
      'The step “Follow-up questionnaire” is now called “Closing questionnaire”.',
    ]);
  });
});

describe('consentChangeParagraph', () => {
  it('joins the sentences, or says the wording changed when none is specific', () => {
    expect(consentChangeParagraph(['A changed.', 'B is new.'])).toBe('A changed. B is new.');
    expect(consentChangeParagraph([])).toMatch(/updated the wording/);
  });
});
