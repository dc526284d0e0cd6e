import { describe, expect, it } from 'vitest';
import { ConsentError } from './consent-error';
import { wayfindingConsentFields } from './consent-fields.fixture';
import { renderConsentPlainText } from './consent-markdown';
import { consentTemplateView, fillConsentTemplate } from './consent-template';

describe('fillConsentTemplate', () => {
  const body = fillConsentTemplate(wayfindingConsentFields);
  const text = renderConsentPlainText(body);

  it('fills every placeholder from the study fields', () => {
    expect(body).not.toMatch(/\{\{|\}\}|to fill/);
    expect(text).toContain('Consent to take part in a research study: Wayfinding cues');
    expect(text).toContain('Harbor Lane Institute · Harbor Lane Cognition Lab · Protocol number HLCL-2025-014');
    expect(text).toContain('contact Dr. Ines Valcourt, the investigator in charge, at wayfinding@harbor-lane.test.');
    expect(text).toContain('About 180 people will take part in this study.');
  });

  it('lists each step with its pay, and the total, formatted as Intl formats the currency', () => {
    const usd = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
    expect(text).toContain(`1. Session 1: practice town — ${usd.format(10)}, about 20 minutes.`);
    expect(text).toContain(
      `2. Session 2: test town — ${usd.format(15)}, about 30 minutes. You find five landmarks in a new town.`,
    );
    expect(text).toContain(`3. Follow-up questionnaire — ${usd.format(5)}, about 10 minutes.`);
    expect(text).toContain(`up to ${usd.format(30)} in all`);
    // Total time from the steps' minutes: 20 + 30 + 10.
    expect(text).toContain('about 1 hour in total, spread over 3 steps');
  });

  it('writes amounts in a currency without minor units the way Intl does (JPY: ISO 4217 exponent 0)', () => {
    const view = consentTemplateView({
      ...wayfindingConsentFields,
      currency: 'JPY',
      steps: [{ title: 'Only step', payMinor: 1500 }],
    });
    expect(view.totalPay).toBe(new Intl.NumberFormat('en-US', { style: 'currency', currency: 'JPY' }).format(1500));
  });

  it('has the payment-terms section: pay per step, proration on withdrawal, how and when, tax note', () => {
    expect(text).toContain('Each step has its own pay, listed above; completing every step pays $30.00.');
    expect(text).toContain(
      'If you withdraw, or the research team ends your participation, you are paid for every step you completed',
    );
    expect(text).toContain(
      'Payment is sent by bank transfer through our payment provider within 7 days after a completed step is confirmed.',
    );
    expect(text).toContain('Harbor Lane Institute’s finance office may ask for your details');
  });

  it('never shows the staff notice or the element markers to participants', () => {
    expect(body).toContain('not legal advice');
    expect(text).not.toContain('not legal advice');
    expect(text).not.toContain('element:');
  });

  it('drops the optional 46.116(c) sections the study switches off', () => {
    const trimmed = renderConsentPlainText(
      fillConsentTemplate({
        ...wayfindingConsentFields,
        include: { investigatorEndsParticipation: false, withdrawalConsequences: false, participantCount: false },
      }),
    );
    expect(trimmed).not.toContain('When the research team may end your participation');
    expect(trimmed).not.toContain('If you decide to stop');
    expect(trimmed).not.toContain('How many people will take part');
    expect(trimmed).toContain('Payment terms');
  });

  it('states one of the two (b)(9) statements, as the study chooses', () => {
    expect(text).toContain(
      'may be used for future research or shared with other researchers without asking for your consent again',
    );
    const noFutureUse = renderConsentPlainText(
      fillConsentTemplate({ ...wayfindingConsentFields, futureUseDeidentified: false }),
    );
    expect(noFutureUse).toContain('will not be used or shared for future research studies, even if your name');
    expect(noFutureUse).not.toContain('without asking for your consent again');
  });

  it('marks free-text details the study has not given yet as "to fill"', () => {
    const draft = renderConsentPlainText(
      fillConsentTemplate({
        studyTitle: 'Checkout flows',
        steps: [{ title: 'Session', payMinor: 800 }],
        currency: 'EUR',
        futureUseDeidentified: false,
      }),
    );
    for (const label of [
      'ethics protocol number',
      'institution',
      'investigator in charge',
      'total time',
      'how payment is sent',
      'approximate number of participants',
    ]) {
      expect(draft).toContain(`[to fill: ${label}]`);
    }
  });

  it('shows a field containing Markdown as the literal text typed', () => {
    const tricky = renderConsentPlainText(
      fillConsentTemplate({ ...wayfindingConsentFields, studyTitle: '*Cues* & [maps](https://x.test) <b>' }),
    );
    expect(tricky).toContain('Consent to take part in a research study: *Cues* & [maps](https://x.test) <b>');
  });

  it('refuses structurally wrong fields, naming each one', () => {
    try {
      fillConsentTemplate({
        ...wayfindingConsentFields,
        studyTitle: ' ',
        currency: 'usd',
        steps: [
          { title: 'A', payMinor: -5 },
          { title: '', payMinor: 1.5 },
        ],
        targetSize: 0,
      });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ConsentError);
      expect((error as ConsentError).fieldErrors.map((e) => e.field)).toEqual([
        'studyTitle',
        'currency',
        'steps[0].payMinor',
        'steps[1].title',
        'steps[1].payMinor',
        'targetSize',
      ]);
    }
    expect(() => fillConsentTemplate({ ...wayfindingConsentFields, steps: [] })).toThrow(
      'steps: must list at least one step with its pay',
    );
  });

  it('refuses an unknown template or one that is not a consent form', () => {
    expect(() => fillConsentTemplate(wayfindingConsentFields, 'consent/none')).toThrow(
      /^templateId: no template "consent\/none"/,
    );
    expect(() => fillConsentTemplate(wayfindingConsentFields, 'email/signed-copy')).toThrow(
      'templateId: "email/signed-copy" is not a consent form template',
    );
  });
});
