import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { VerificationPanel } from './verification-panel';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const verifyPath = `GET /api/studies/${studyId}/assignment/verify`;
const conditions = [
  { id: 'c-a', code: 'A', internalName: 'audio cues', allocationWeight: 1 },
  { id: 'c-b', code: 'B', internalName: 'map cues', allocationWeight: 1 },
];
const check = (position: number, expected: string, recorded: string) => ({
  arrivalPosition: position,
  enrollmentId: `e0000000-0000-4000-8000-00000000000${position}`,
  stratumKey: 'sense_of_direction=<50',
  expected: { conditionId: expected, order: null },
  recorded: { conditionId: recorded, order: null },
  matches: expected === recorded,
});

describe('VerificationPanel', () => {
  it('checks nothing until asked, then reports every match', async () => {
    const { requests } = stubApi({
      [verifyPath]: {
        status: 200,
        body: {
          allMatch: true,
          commitmentMatches: true,
          matched: 2,
          mismatched: 0,
          seed: 'ab'.repeat(32),
          commitment: 'cd'.repeat(32),
          checks: [check(1, 'c-a', 'c-a'), check(2, 'c-b', 'c-b')],
        },
      },
    });
    renderWithProviders(<VerificationPanel studyId={studyId} conditions={conditions} />);
    expect(requests).toHaveLength(0);

    await userEvent.click(screen.getByRole('button', { name: 'Verify sequence' }));
    expect(await screen.findByText(/all 2 recorded assignments match/)).toBeInTheDocument();
    expect(screen.queryByRole('table')).not.toBeInTheDocument();
  });

  it('lists the rows that differ from the derived sequence', async () => {
    stubApi({
      [verifyPath]: {
        status: 200,
        body: {
          allMatch: false,
          commitmentMatches: true,
          matched: 1,
          mismatched: 1,
          seed: 'ab'.repeat(32),
          commitment: 'cd'.repeat(32),
          checks: [check(1, 'c-a', 'c-a'), check(2, 'c-a', 'c-b')],
        },
      },
    });
    renderWithProviders(<VerificationPanel studyId={studyId} conditions={conditions} />);

    await userEvent.click(screen.getByRole('button', { name: 'Verify sequence' }));
    expect(await screen.findByText(/1 of 2 recorded assignments differ/)).toBeInTheDocument();
    const rows = within(
      screen.getByRole('table', { name: 'Assignments that differ from the derived sequence' }),
    ).getAllByRole('row');
    expect(rows).toHaveLength(2);
    expect(rows[1]).toHaveTextContent('2');
    expect(rows[1]).toHaveTextContent('sense of direction <50');
    expect(
      within(rows[1] as HTMLElement)
        .getAllByRole('cell')
        .map((cell) => cell.textContent)
        .slice(-2),
    ).toEqual(['A', 'B']);
  });

  it('lists enrollments whose recorded condition is not their allocation, though the sequence itself matches', async () => {
    const changed = {
      enrollmentId: 'e0000000-0000-4000-8000-000000000002',
      reason: 'differs-from-allocation',
      enrollment: { conditionId: 'c-b', order: null },
      allocation: { conditionId: 'c-a', order: null },
      expected: { conditionId: 'c-a', order: null },
    };
    stubApi({
      [verifyPath]: {
        status: 200,
        body: {
          allMatch: false,
          commitmentMatches: true,
          matched: 2,
          mismatched: 0,
          seed: 'ab'.repeat(32),
          commitment: 'cd'.repeat(32),
          checks: [check(1, 'c-a', 'c-a'), check(2, 'c-a', 'c-a')],
          enrollmentMismatches: [changed],
        },
      },
    });
    renderWithProviders(<VerificationPanel studyId={studyId} conditions={conditions} />);

    await userEvent.click(screen.getByRole('button', { name: 'Verify sequence' }));
    expect(await screen.findByText(/1 enrollment records a condition that is not its allocation/)).toBeInTheDocument();
    const list = screen.getByRole('region', { name: 'Enrollments that differ from their allocation' });
    expect(within(list).getAllByRole('listitem')).toHaveLength(1);
    expect(list).toHaveTextContent('Recorded condition differs from its allocation');
    expect(list).toHaveTextContent(changed.enrollmentId);
    expect(list).toHaveTextContent('Recorded B, allocation A, sequence A');
  });

  it('shows the api’s 409 while the seed is still sealed', async () => {
    stubApi({
      [verifyPath]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'SEED_STILL_SEALED',
          message: 'The seed is still sealed: verification is possible after closure or an audited unblinding.',
        },
      },
    });
    renderWithProviders(<VerificationPanel studyId={studyId} conditions={conditions} />);

    await userEvent.click(screen.getByRole('button', { name: 'Verify sequence' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('The seed is still sealed');
  });
});
