import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import type { DryRunFactor } from '../api/dry-run-schema';
import type { DryRunStartingMix } from '../api/get-starting-mix';
import type { SchemeContext } from '../utils/scheme-settings';
import { DryRunPanel } from './dry-run-panel';

const studyId = '3c2b1a09-8f7e-4d6c-9b5a-4e3d2c1b0a99';
const conditions = [
  { id: 'c-a', code: 'A', internalName: 'lantern signs', allocationWeight: 1 },
  { id: 'c-b', code: 'B', internalName: 'floor arrows', allocationWeight: 1 },
];
const factors: DryRunFactor[] = [
  { key: 'pretest', kind: 'numeric', cutPoints: [40, 60], categories: null },
  { key: 'site', kind: 'categorical', cutPoints: null, categories: ['north', 'south'] },
];
const context: SchemeContext = {
  design: 'between',
  conditionWeights: [1, 1],
  factors: factors.map(({ key, kind }) => ({ key, kind })),
};

// A result in the shape of api/src/randomization/dry-run.ts (DryRunResult); the numbers only need to be consistent.
const result = {
  arrivals: 8,
  arms: [
    { armId: 'c-a', label: 'c-a', count: 4, share: 0.5, targetShare: 0.5 },
    { armId: 'c-b', label: 'c-b', count: 4, share: 0.5, targetShare: 0.5 },
  ],
  strata: [
    { stratumKey: 'pretest=<40|site=north', total: 3, counts: { 'c-a': 2, 'c-b': 1 }, imbalance: 1 },
    { stratumKey: 'pretest=≥60|site=south', total: 5, counts: { 'c-a': 2, 'c-b': 3 }, imbalance: 1 },
  ],
  factorLevels: [
    { factorId: 'pretest', level: '<40', total: 3, counts: { 'c-a': 2, 'c-b': 1 }, imbalance: 1 },
    { factorId: 'site', level: 'south', total: 5, counts: { 'c-a': 2, 'c-b': 3 }, imbalance: 1 },
  ],
  imbalanceOverTime: [
    { arrivals: 4, overall: 2, largestInStratum: 1, largestInFactorLevel: 2 },
    { arrivals: 8, overall: 1, largestInStratum: 1, largestInFactorLevel: 1 },
  ],
  largestImbalance: { overall: 2, inStratum: 1, inFactorLevel: 2 },
  finalImbalance: { overall: 0, inStratum: 1, inFactorLevel: 1 },
  matchedPairs: null,
  seed: 'ab'.repeat(32),
};

function renderPanel(savedMethod: string | null = 'minimization', startingMix: DryRunStartingMix | null = null) {
  return renderWithProviders(
    <DryRunPanel
      startingMix={startingMix}
      studyId={studyId}
      context={context}
      conditions={conditions}
      factors={factors}
      savedMethod={savedMethod}
      savedSettings={{}}
    />,
  );
}

describe('DryRunPanel', () => {
  it('sends arrivals and the covariate mix, shows progress while the one request runs, then the tables and chart', async () => {
    let answer: (value: { status: number; body: unknown }) => void = () => {};
    const { requests } = stubApi({
      [`POST /api/studies/${studyId}/assignment/dry-run`]: () => new Promise((resolve) => (answer = resolve)),
    });
    renderPanel();

    expect(screen.getByLabelText('Simulated arrivals')).toHaveValue('1000');
    // Cut points 40 and 60: the default average sits between them and the spread is their distance.
    expect(screen.getByLabelText('Average')).toHaveValue('50');
    expect(screen.getByLabelText('Standard deviation')).toHaveValue('20');
    await userEvent.clear(screen.getByLabelText('Share south'));
    await userEvent.type(screen.getByLabelText('Share south'), '3');
    await userEvent.click(screen.getByRole('button', { name: 'Run dry run' }));

    expect(await screen.findByRole('progressbar', { name: 'Dry run in progress' })).toBeInTheDocument();
    expect(screen.getByText(/Simulating 1,000 arrivals/)).toBeInTheDocument();
    expect(requests[0]?.body).toEqual({
      arrivals: 1000,
      covariateMix: {
        pretest: { kind: 'normal', mean: 50, sd: 20 },
        site: { kind: 'categorical', proportions: { north: 1, south: 3 } },
      },
    });

    answer({ status: 200, body: result });
    expect(
      await screen.findByRole('heading', { name: /Result: 8 simulated arrivals · Minimization/ }),
    ).toBeInTheDocument();
    expect(screen.queryByRole('progressbar')).not.toBeInTheDocument();
    const strata = screen.getByRole('table', { name: 'Simulated balance per stratum' });
    expect(
      within(strata)
        .getAllByRole('rowheader')
        .map((cell) => cell.textContent),
    ).toEqual(['pretest <40 · site north', 'pretest ≥60 · site south']);
    const levels = screen.getByRole('table', { name: 'Simulated balance per factor level' });
    expect(
      within(levels)
        .getAllByRole('rowheader')
        .map((cell) => cell.textContent),
    ).toEqual(['pretest <40', 'site south']);
    expect(
      screen.getByRole('img', {
        name: /largest imbalance over 8 arrivals\. All participants: at most 2; Worst stratum: at most 1; Worst factor level: at most 2/,
      }),
    ).toBeInTheDocument();
  });

  it('starts from the screened people’s mix, says so, and runs with one click', async () => {
    const { requests } = stubApi({
      [`POST /api/studies/${studyId}/assignment/dry-run`]: { status: 200, body: result },
    });
    renderPanel('minimization', {
      basis: 'observed',
      people: 48,
      mix: {
        pretest: { kind: 'normal', mean: 57.25, sd: 11.4 },
        site: { kind: 'categorical', proportions: { north: 30, south: 18 } },
      },
    });

    expect(
      screen.getByText('Using the mix of the 48 people screened so far. Change it to try another.'),
    ).toBeInTheDocument();
    expect(screen.getByLabelText('Average')).toHaveValue('57.25');
    expect(screen.getByLabelText('Standard deviation')).toHaveValue('11.4');
    expect(screen.getByLabelText('Share north')).toHaveValue('30');
    await userEvent.click(screen.getByRole('button', { name: 'Run dry run' }));

    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]?.body).toEqual({
      arrivals: 1000,
      covariateMix: {
        pretest: { kind: 'normal', mean: 57.25, sd: 11.4 },
        site: { kind: 'categorical', proportions: { north: 30, south: 18 } },
      },
    });
    expect(await screen.findByRole('heading', { name: /Result: 8 simulated arrivals/ })).toBeInTheDocument();
  });

  it('says when nobody is screened yet and the mix is even', () => {
    stubApi({});
    renderPanel('minimization', {
      basis: 'even',
      people: 0,
      mix: {
        pretest: { kind: 'normal', mean: 50, sd: 20 },
        site: { kind: 'categorical', proportions: { north: 1, south: 1 } },
      },
    });
    expect(screen.getByText(/^No one screened yet: using an even mix/)).toBeInTheDocument();
    expect(screen.getByLabelText('Share south')).toHaveValue('1');
  });

  it('compares another scheme with its own settings and checks them first', async () => {
    const { requests } = stubApi({
      [`POST /api/studies/${studyId}/assignment/dry-run`]: { status: 200, body: result },
    });
    renderPanel();

    await userEvent.click(screen.getByRole('switch', { name: 'Try another scheme' }));
    await userEvent.click(screen.getByRole('radio', { name: 'Permuted blocks' }));
    await userEvent.clear(screen.getByLabelText('Allowed block sizes'));
    await userEvent.type(screen.getByLabelText('Allowed block sizes'), '3');
    await userEvent.click(screen.getByRole('button', { name: 'Run dry run' }));
    expect(await screen.findByText(/3 is not a multiple of the total weight 2/)).toBeInTheDocument();
    expect(requests).toHaveLength(0);

    await userEvent.clear(screen.getByLabelText('Allowed block sizes'));
    await userEvent.type(screen.getByLabelText('Allowed block sizes'), '2, 4');
    await userEvent.clear(screen.getByLabelText('Simulated arrivals'));
    await userEvent.type(screen.getByLabelText('Simulated arrivals'), '100000');
    await userEvent.click(screen.getByRole('button', { name: 'Run dry run' }));
    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]?.body).toMatchObject({
      arrivals: 100000,
      method: 'permuted-blocks',
      settings: { blockSizes: [2, 4] },
    });
  }, 20_000);

  it('refuses more than 100,000 arrivals and a malformed seed', async () => {
    const { requests } = stubApi({});
    renderPanel();

    await userEvent.clear(screen.getByLabelText('Simulated arrivals'));
    await userEvent.type(screen.getByLabelText('Simulated arrivals'), '100001');
    await userEvent.type(screen.getByLabelText('Seed (optional)'), 'not-hex');
    await userEvent.click(screen.getByRole('button', { name: 'Run dry run' }));

    expect(await screen.findByText('Enter a whole number of arrivals from 1 to 100,000.')).toBeInTheDocument();
    expect(
      screen.getByText('A seed is 64 hexadecimal characters; leave it empty for a fresh one.'),
    ).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });
});
