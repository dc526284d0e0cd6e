import { render, screen, within } from '@testing-library/react';
import { RouterProvider, createMemoryRouter } from 'react-router-dom';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { AppProvider } from './provider';
import { routes } from './router';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const base = `/api/studies/${studyId}`;
const researcher = {
  id: 'a0000000-0000-4000-8000-000000000003',
  email: 'researcher@evenhand.test',
  name: 'Demo Researcher',
  role: 'researcher',
  active: true,
};
const coordinator = {
  ...researcher,
  id: 'a0000000-0000-4000-8000-000000000002',
  email: 'coordinator@evenhand.test',
  role: 'coordinator',
};

const study = {
  id: studyId,
  slug: 'wayfinding-cues',
  title: 'Wayfinding cues',
  status: 'recruiting',
  design: 'between',
  protocolNumber: 'HLCL-2026-014',
  summary: '',
  estimatedMinutes: 75,
  targetSize: 150,
  budgetMinor: 600000,
  currency: 'USD',
  blinded: true,
  labName: 'Harbor Lane Cognition Lab',
  contactEmail: null,
  openedAt: '2026-12-01T19:45:15.724Z',
  closedAt: null,
  createdAt: '2026-12-01T19:45:15.598Z',
  designLocked: true,
  archivedAt: null,
  ethicsApprovalReference: null,
  assignedCount: 0,
  editRules: [],
};
const conditions = ['A', 'B', 'C'].map((code, i) => ({
  id: `c000000${i}-0000-4000-8000-000000000000`,
  code,
  internalName: null,
  participantLabel: `Route guide, version ${i + 1}`,
  participantInstructions: '',
  allocationWeight: 1,
  position: i + 1,
}));
const commitment = 'cfd28da421c67e5e342021be7b6173aa1a19c42cee28817e4b208c3887a6480b';
const assignment = {
  method: 'stratified-blocks',
  settings: { blockSizes: [3, 6] },
  commitment,
  committedAt: '2026-12-01T19:45:15.720Z',
  sealedParameters: { method: 'stratified-blocks' },
  seed: null,
  seedRevealedAt: null,
  unblindedAt: null,
  unblindReason: null,
  allocated: 5,
  balance: [
    {
      stratumKey: 'sense_of_direction=<50',
      total: 5,
      counts: [
        { armId: conditions[0]?.id, count: 2 },
        { armId: conditions[1]?.id, count: 2 },
        { armId: conditions[2]?.id, count: 1 },
      ],
    },
  ],
  pretestNote: 'Evenhand never assigns by a pretest cut-off.',
};

function stubStudy(me: typeof researcher) {
  return stubApi({
    'GET /api/auth/me': { status: 200, body: me },
    [`GET ${base}`]: { status: 200, body: study },
    [`GET ${base}/assignment`]: { status: 200, body: assignment },
    [`GET ${base}/conditions`]: { status: 200, body: { items: conditions } },
    [`GET ${base}/steps`]: {
      status: 200,
      body: {
        items: [
          {
            id: 'e9a9b7bd-e2fb-4d26-a72e-60dee927320b',
            position: 1,
            title: 'Session 1',
            description: '',
            payMinor: 1000,
            hasCompletionCode: false,
            verification: 'staff',
            taskUrl: null,
            opensAfterDays: 0,
            opensFrom: 'previous-step',
            dueWithinDays: null,
            payOverrides: [],
          },
        ],
        currency: 'USD',
        totalPayMinor: 1000,
        hasPayOverrides: false,
      },
    },
    [`GET ${base}/stratification-factors`]: {
      status: 200,
      body: {
        items: [
          {
            id: 'f1',
            key: 'sense_of_direction',
            label: 'Sense of direction (0–100)',
            kind: 'numeric',
            cutPoints: [50],
            categories: null,
            minimizationWeight: 1,
            levels: ['<50', '≥50'],
          },
        ],
        pretestNote: assignment.pretestNote,
      },
    },
    [`GET ${base}/screening-questions`]: { status: 200, body: { items: [] } },
    [`GET ${base}/steps/return-link`]: {
      status: 200,
      body: {
        returnAddressTemplate: 'http://127.0.0.1:5173/api/return/{token}',
        parameters: [],
        keyId: 1,
        rotatedAt: null,
        graceDays: 14,
        validDays: 30,
      },
    },
    [`GET ${base}/reminder-plan`]: {
      status: 200,
      body: {
        rules: [],
        suggestLostAfter: 3,
        enabled: true,
        updatedAt: null,
        previewSubject: 'Reminder',
        previewText: 'Hello',
      },
    },
  });
}

function renderApp(path: string) {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return router;
}

describe('study pages', () => {
  it('opens a study on its set-up, with the header, the shortened fingerprint and the sub-navigation', async () => {
    stubStudy(researcher);
    const router = renderApp(`/studies/${studyId}`);

    expect(await screen.findByRole('heading', { name: 'Wayfinding cues', level: 1 })).toBeInTheDocument();
    expect(await screen.findByRole('table', { name: 'Conditions' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe(`/studies/${studyId}/setup`);
    expect(screen.getByRole('link', { name: /Sequence fingerprint cfd28da4…6480b/ })).toBeInTheDocument();
    const tabs = screen.getByRole('navigation', { name: 'Study' });
    expect(
      within(tabs)
        .getAllByRole('link')
        .map((link) => link.textContent),
    ).toEqual(['Set-up', 'Assignment', 'Consent', 'Roster', 'Dropout watch', 'Pay']);
    expect(within(tabs).getByRole('link', { name: 'Set-up' })).toHaveAttribute('aria-current', 'page');
    expect(screen.getByRole('button', { name: 'Pause' })).toBeInTheDocument();
  });

  it('keeps the design read-only after the first assignment and shows hidden names as codes', async () => {
    stubStudy(researcher);
    renderApp(`/studies/${studyId}/setup`);

    const table = await screen.findByRole('table', { name: 'Conditions' });
    expect(within(table).getAllByText('Hidden while blinded')).toHaveLength(3);
    expect(screen.queryByRole('button', { name: 'Add condition' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Edit factors' })).not.toBeInTheDocument();
    expect(await screen.findByText('Stratified permuted blocks')).toBeInTheDocument();
    expect(screen.queryByRole('form', { name: 'Assignment scheme' })).not.toBeInTheDocument();
    expect(screen.getAllByText(/someone has already been assigned/).length).toBeGreaterThanOrEqual(3);
    expect(screen.getByText('Evenhand never assigns by a pretest cut-off.')).toBeInTheDocument();
  });

  it('leaves pay exceptions to researchers', async () => {
    stubStudy(coordinator);
    renderApp(`/studies/${studyId}/setup`);

    expect(await screen.findByRole('button', { name: 'Edit step 1' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Pay one condition differently/ })).not.toBeInTheDocument();
    expect(screen.getByText(/Paying one condition differently is a researcher’s decision/)).toBeInTheDocument();
  });

  it('shows the full fingerprint and the balance per stratum; only a researcher may unblind', async () => {
    stubStudy(researcher);
    renderApp(`/studies/${studyId}/assignment`);

    expect(await screen.findByText(commitment)).toBeInTheDocument();
    const balance = screen.getByRole('table', { name: 'Assignments per stratum and condition' });
    expect(
      within(balance)
        .getAllByRole('columnheader')
        .map((cell) => cell.textContent),
    ).toEqual(['Stratum', 'A', 'B', 'C', 'Total']);
    expect(within(balance).getByRole('rowheader')).toHaveTextContent('sense of direction <50');
    expect(screen.getByRole('button', { name: 'Unblind…' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Verify sequence' })).not.toBeInTheDocument();
  });

  it('does not offer unblinding to a coordinator', async () => {
    stubStudy(coordinator);
    renderApp(`/studies/${studyId}/assignment`);

    expect(await screen.findByText(commitment)).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Unblind…' })).not.toBeInTheDocument();
  });

  it('says plainly when a study is not available', async () => {
    stubApi({
      'GET /api/auth/me': { status: 200, body: researcher },
      [`GET ${base}`]: { status: 404, body: { statusCode: 404, code: 'NOT_FOUND', message: 'No such study.' } },
      [`GET ${base}/assignment`]: {
        status: 404,
        body: { statusCode: 404, code: 'NOT_FOUND', message: 'No such study.' },
      },
    });
    renderApp(`/studies/${studyId}/setup`);

    expect(await screen.findByText('Study not available')).toBeInTheDocument();
  });
});
