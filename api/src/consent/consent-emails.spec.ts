import { describe, expect, it } from 'vitest';
import { ConsentError } from './consent-error';
import { renderEmail } from './consent-emails';
import { describeSigningTime, formatMoney } from './study-formatting';

const common = {
  participantName: 'Noor Adebayo-Lindqvist',
  studyTitle: 'Wayfinding cues',
  labName: 'Harbor Lane Cognition Lab',
  investigatorName: 'Dr. Ines Valcourt',
  contactEmail: 'wayfinding@harbor-lane.test',
  portalUrl: 'http://127.0.0.1:5173/studies/wayfinding-cues',
};

describe('participant e-mails', () => {
  it('signed copy: says the PDF is attached and gives the version, time and fingerprint', () => {
    const fingerprint = 'a'.repeat(64);
    const mail = renderEmail('email/signed-copy', {
      ...common,
      signedAt: describeSigningTime(new Date('2025-03-14T09:26:53Z'), 'Europe/Berlin').text,
      formVersion: 2,
      textFingerprint: fingerprint,
    });
    expect(mail.subject).toBe('Your signed consent form for Wayfinding cues');
    expect(mail.text).toContain('Hello Noor Adebayo-Lindqvist,');
    expect(mail.text).toContain(
      'Attached is a PDF copy of the consent form you signed on 2025-03-14 09:26:53 UTC (10:26:53 in Europe/Berlin, UTC+01:00) (form version 2).',
    );
    expect(mail.text).toContain(fingerprint);
    expect(mail.text).toContain('open your study page (http://127.0.0.1:5173/studies/wayfinding-cues)');
    expect(mail.html).toContain(
      '<a href="http://127.0.0.1:5173/studies/wayfinding-cues" rel="noopener noreferrer">open your study page</a>',
    );
    expect(mail.text + mail.html).not.toContain('STAFF NOTICE');
  });

  it('withdrawal confirmation: shows what was earned, paid and is still to come', () => {
    const view = {
      ...common,
      participantName: null,
      withdrawnAt: '2025-04-02 15:00:00 UTC',
      earnedAmount: formatMoney(2500, 'USD'),
      paidAmount: formatMoney(1000, 'USD'),
      owedAmount: formatMoney(1500, 'USD'),
      hasOwedAmount: true,
      paymentMethod: 'bank transfer',
      paymentDays: 7,
    };
    const mail = renderEmail('email/withdrawal-confirmation', view);
    expect(mail.subject).toBe('You have stopped taking part in Wayfinding cues');
    expect(mail.text).toMatch(/^Hello,\n/);
    expect(mail.text).toContain(
      '• Earned for completed steps: $25.00\n• Already paid: $10.00\n• Still to be paid to you: $15.00',
    );
    expect(mail.text).toContain('The amount still owed is sent by bank transfer within 7 days.');

    const settled = renderEmail('email/withdrawal-confirmation', {
      ...view,
      owedAmount: formatMoney(0, 'USD'),
      hasOwedAmount: false,
    });
    expect(settled.text).not.toContain('The amount still owed');
  });

  it('re-consent request and invitation fill their own fields', () => {
    const reconsent = renderEmail('email/re-consent-request', {
      ...common,
      formVersion: 3,
      ethicsBoardName: 'the Harbor Lane Research Ethics Board',
      changeSummary: 'Session 2 is now 10 minutes shorter.',
    });
    expect(reconsent.text).toContain('the new version (3) has been approved by the Harbor Lane Research Ethics Board.');
    expect(reconsent.text).toContain('What changed: Session 2 is now 10 minutes shorter.');

    const invitation = renderEmail('email/study-invitation', {
      ...common,
      institutionName: 'Harbor Lane Institute',
      studySummary: 'A study of how people find their way in a virtual town.',
      estimatedDuration: '1 hour',
      stepsPhrase: '3 steps',
      totalPay: '$30.00',
    });
    expect(invitation.subject).toBe('Invitation to take part in a research study: Wayfinding cues');
    expect(invitation.text).toContain('• Pay: you are paid for each step you complete, up to $30.00 in all.');
  });

  it('invitation: names the lab once when lab and institution are the same', () => {
    const view = {
      ...common,
      studySummary: 'A study of how people find their way in a virtual town.',
      estimatedDuration: '1 hour',
      stepsPhrase: '3 steps',
      totalPay: '$30.00',
    };
    const same = renderEmail('email/study-invitation', { ...view, institutionName: ' harbor lane cognition lab ' });
    expect(same.text).toContain('Harbor Lane Cognition Lab invites you to take part in a research study');
    expect(same.text).not.toMatch(/Harbor Lane Cognition Lab at /i);
    const other = renderEmail('email/study-invitation', { ...view, institutionName: 'Harbor Lane Institute' });
    expect(other.text).toContain(
      'Harbor Lane Cognition Lab at Harbor Lane Institute invites you to take part in a research study',
    );
  });

  it('keeps a subject on one line whatever the study title holds', () => {
    const mail = renderEmail('email/signed-copy', {
      ...common,
      studyTitle: 'Cues\r\nBcc: someone@else.test',
      signedAt: 'x',
      formVersion: 1,
      textFingerprint: 'b'.repeat(64),
    });
    expect(mail.subject).toBe('Your signed consent form for Cues Bcc: someone@else.test');
  });

  it('refuses a portal address that is not an absolute web address', () => {
    expect(() =>
      renderEmail('email/signed-copy', {
        ...common,
        portalUrl: '/studies/x',
        signedAt: 'x',
        formVersion: 1,
        textFingerprint: 'c'.repeat(64),
      }),
    ).toThrow(ConsentError);
  });
});
