import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { ImportResult } from '../api/import-roster';
import { ImportReport, shownReportRows } from './import-report';

// In the shape of api/src/enrollments/roster-import.ts: header notes on line 1, then rows by line number.
const result: ImportResult = {
  created: 2,
  alreadyEnrolled: 1,
  ignoredColumns: ['shoe_size'],
  errors: [
    {
      line: 1,
      field: 'sense_of_direction',
      message: 'the header row has no "sense_of_direction" column; those answers will be asked at screening',
    },
    { line: 4, field: 'email', message: '"not-an-address" is not an e-mail address' },
    { line: 6, field: 'sense_of_direction', message: '"lots" is not a number' },
  ],
};

describe('ImportReport', { timeout: 15_000 }, () => {
  it('sums up who was added, who was already there and how many rows were refused', () => {
    render(<ImportReport result={result} />);
    const tiles = within(screen.getByRole('list', { name: 'Import summary' })).getAllByRole('listitem');
    expect(tiles.map((tile) => tile.textContent)).toEqual([
      '2people added',
      '1already on the roster, left as they were',
      '2rows refused',
    ]);
  });

  it('lists every problem row by row with its line, column and message', () => {
    render(<ImportReport result={result} />);
    const table = screen.getByRole('table', { name: 'Problems found, row by row' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(
      rows.map((row) =>
        within(row)
          .getAllByRole('cell')
          .map((cell) => cell.textContent),
      ),
    ).toEqual([
      [
        'Header',
        'sense_of_direction',
        'the header row has no "sense_of_direction" column; those answers will be asked at screening',
      ],
      ['4', 'email', '"not-an-address" is not an e-mail address'],
      ['6', 'sense_of_direction', '"lots" is not a number'],
    ]);
  });

  it('names the columns that were not used', () => {
    render(<ImportReport result={result} />);
    expect(screen.getByText(/1 column was not used/)).toHaveTextContent('shoe_size');
  });

  it('says every row was read when there is nothing to report', () => {
    render(<ImportReport result={{ created: 5, alreadyEnrolled: 0, ignoredColumns: [], errors: [] }} />);
    expect(screen.getByText('Every row was read without a problem.')).toBeInTheDocument();
    expect(screen.queryByRole('table')).not.toBeInTheDocument();
  });

  it('shows the first rows of a long report and points to the download for the rest', () => {
    const errors = Array.from({ length: shownReportRows + 50 }, (_, index) => ({
      line: index + 2,
      field: 'email',
      message: 'is empty',
    }));
    render(<ImportReport result={{ created: 0, alreadyEnrolled: 0, ignoredColumns: [], errors }} />);
    expect(within(screen.getByRole('table')).getAllByRole('row')).toHaveLength(shownReportRows + 1);
    expect(
      screen.getByText(
        `Showing the first ${shownReportRows} of ${shownReportRows + 50} problems; the downloaded report has them all.`,
      ),
    ).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Download the report (CSV)' })).toBeInTheDocument();
  });
});
