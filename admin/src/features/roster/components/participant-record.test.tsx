import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { ParticipantRecord } from './participant-record';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const enrollmentId = '4402fb12-dfaa-46db-8a66-c05bd2341015';
const fingerprint = '5701176dac1c5027a5af23de4f6d7cf8cc45afecca0bedc7aa408bf06266cd21';

const record = {
  enrollment: {
    id: enrollmentId,
    reference: 'P-3X66FX',
    email: 'p048@evenhand.test',
    name: null,
    status: 'withdrew',
    condition: 'C',
    stratumKey: 'sense_of_direction=≥50',
    covariates: { sense_of_direction: 59 },
    needsReconsent: false,
    signedVersion: 1,
    invitationSentAt: null,
    assignedAt: '2026-12-01T19:45:19.016Z',
    createdAt: '2026-12-01T19:45:18.994Z',
    nextStep: null,
    unansweredReminders: 0,
    suggestLost: false,
  },
  withdrawalReason: 'Moved abroad',
  lostReason: null,
  exclusionReason: null,
  signatures: [
    {
      id: 'ff0a5201-6250-4875-a4aa-b13be494d4ab',
      version: 1,
      signedAt: '2026-12-01T19:45:19.023Z',
      typedName: 'Demo Participant 048',
      meaning: 'I have read this form and agree to take part',
      textFingerprint: fingerprint,
      pdfSha256: '1cfd7d716072bb3b3af5e46da6035e155b2a1ec0c8a2a005dab245fa4e70cf1b',
      ip: '127.0.0.1',
      userAgent: 'Evenhand demo loader',
      hasMark: false,
    },
  ],
  steps: [],
  // Deliberately out of order: the record lists events oldest first whatever order they arrive in.
  timeline: [
    {
      at: '2026-12-01T19:45:19.029Z',
      action: 'consent.signed',
      name: 'Consent signed',
      sentence: 'Participant P-3X66FX signed consent version 1.',
      actorEmail: 'p048@evenhand.test',
      data: { version: 1 },
    },
    {
      at: '2026-12-01T19:45:18.996Z',
      action: 'enrollment.joined',
      name: 'Joined',
      sentence: 'Participant P-3X66FX joined the study.',
      actorEmail: 'p048@evenhand.test',
      data: { reference: 'P-3X66FX' },
    },
    {
      at: '2026-12-02T08:00:00.000Z',
      action: 'enrollment.withdrew',
      name: 'Withdrew',
      sentence: 'Coordinator C. Vasquez-Hale withdrew participant P-3X66FX from the study, saying “Moved abroad”.',
      actorEmail: 'coordinator@evenhand.test',
      data: { reason: 'Moved abroad', by: 'staff' },
    },
  ],
};

const noContacts = { items: [], unansweredReminders: 0, suggestLostAfter: 3, suggestLost: false };

describe('ParticipantRecord', { timeout: 15_000 }, () => {
  it('shows status, reasons, each signature with its fingerprints, and the timeline oldest first', async () => {
    stubApi({
      [`GET /api/studies/${studyId}/enrollments/${enrollmentId}`]: { status: 200, body: record },
      [`GET /api/studies/${studyId}/enrollments/${enrollmentId}/contacts`]: { status: 200, body: noContacts },
    });
    renderWithProviders(
      <ParticipantRecord studyId={studyId} enrollmentId={enrollmentId} blinded backHref="/roster" currency="USD" />,
    );

    const signature = await screen.findByRole('article', { name: 'Signature on version 1' });
    expect(signature).toHaveTextContent('Demo Participant 048');
    expect(signature).toHaveTextContent('“I have read this form and agree to take part”');
    expect(signature).toHaveTextContent(fingerprint);
    expect(signature).toHaveTextContent('Evenhand demo loader');
    expect(within(signature).getByRole('button', { name: 'Download the signed PDF of version 1' })).toBeInTheDocument();

    expect(screen.getByRole('heading', { name: 'P-3X66FX' }).parentElement).toHaveTextContent('P-3X66FXWithdrew');
    expect(screen.getByText('Reason for withdrawal').nextSibling).toHaveTextContent('Moved abroad');
    expect(screen.queryByText('Why lost to follow-up')).not.toBeInTheDocument();
    expect(screen.getByText('Condition (coded while blinded)').nextSibling).toHaveTextContent('C');

    const steps = within(screen.getByRole('region', { name: 'Timeline' })).getAllByRole('listitem');
    expect(steps.map((step) => step.querySelector('p')?.textContent)).toEqual([
      'Participant P-3X66FX joined the study.',
      'Participant P-3X66FX signed consent version 1.',
      'Coordinator C. Vasquez-Hale withdrew participant P-3X66FX from the study, saying “Moved abroad”.',
    ]);
  });

  it('shows what staff noted when they marked someone lost to follow-up', async () => {
    const lost = {
      ...record,
      enrollment: { ...record.enrollment, status: 'lost' },
      withdrawalReason: null,
      lostReason: 'No reply to three reminders',
    };
    stubApi({
      [`GET /api/studies/${studyId}/enrollments/${enrollmentId}`]: { status: 200, body: lost },
      [`GET /api/studies/${studyId}/enrollments/${enrollmentId}/contacts`]: { status: 200, body: noContacts },
    });
    renderWithProviders(
      <ParticipantRecord studyId={studyId} enrollmentId={enrollmentId} blinded backHref="/roster" currency="USD" />,
    );

    expect((await screen.findByText('Why lost to follow-up')).nextSibling).toHaveTextContent(
      'No reply to three reminders',
    );
    expect(screen.queryByText('Reason for withdrawal')).not.toBeInTheDocument();
  });

  it('says so when the participant is not in this study', async () => {
    stubApi({
      [`GET /api/studies/${studyId}/enrollments/${enrollmentId}`]: {
        status: 404,
        body: { statusCode: 404, code: 'NOT_FOUND', message: 'No such participant in this study.' },
      },
    });
    renderWithProviders(
      <ParticipantRecord
        studyId={studyId}
        enrollmentId={enrollmentId}
        blinded={false}
        backHref="/roster"
        currency="USD"
      />,
    );

    expect(await screen.findByText('No such participant')).toBeInTheDocument();
    expect(screen.getByText('No such participant in this study.')).toBeInTheDocument();
  });
});
