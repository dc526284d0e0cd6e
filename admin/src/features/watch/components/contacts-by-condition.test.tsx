import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { AttritionReport } from '../api/get-attrition-report';
import { ContactsByCondition } from './contacts-by-condition';

const rows = [
  {
    conditionId: 'a',
    name: 'A',
    participants: 20,
    contacts: 30,
    meanPerParticipant: 1.5,
    reminders: 24,
    reconsentRequests: 4,
    staffMessages: 2,
  },
  {
    conditionId: 'b',
    name: 'B',
    participants: 19,
    contacts: 57,
    meanPerParticipant: 3,
    reminders: 50,
    reconsentRequests: 5,
    staffMessages: 2,
  },
];

function reportWith(contacts: AttritionReport['contacts']): AttritionReport {
  return { contacts } as AttritionReport;
}

describe('ContactsByCondition', () => {
  it('shows each condition’s contacts, the largest mean difference and Welch’s test', () => {
    render(
      <ContactsByCondition
        report={reportWith({
          conditions: rows,
          largestMeanDifference: 1.5,
          test: {
            method: 'welch-anova',
            statistic: 6.234,
            df1: 1,
            df2: 31.2,
            pValue: 0.018,
            conditionIdsTested: ['a', 'b'],
            notComputable: null,
          },
        })}
      />,
    );
    const table = screen.getByRole('table', { name: 'Contacts after randomization, per condition' });
    expect(within(table).getAllByRole('row')[2]).toHaveTextContent('B19573.005052');
    expect(screen.getByTestId('contacts-test')).toHaveTextContent(
      'Largest difference in mean contacts per participant: 1.50.',
    );
    expect(screen.getByTestId('contacts-test')).toHaveTextContent("Welch's test: F(1, 31.2) = 6.23, p = 0.018.");
    expect(screen.getByText(/screening aid, not the study's analysis/)).toBeInTheDocument();
  });

  it('says in words why the test could not be computed', () => {
    render(
      <ContactsByCondition
        report={reportWith({
          conditions: rows.map((row) => ({
            ...row,
            contacts: 0,
            meanPerParticipant: 0,
            reminders: 0,
            reconsentRequests: 0,
            staffMessages: 0,
          })),
          largestMeanDifference: null,
          test: {
            method: 'welch-anova',
            statistic: null,
            df1: null,
            df2: null,
            pValue: null,
            conditionIdsTested: [],
            notComputable: 'no-variation-within-a-condition',
          },
        })}
      />,
    );
    expect(screen.getByTestId('contacts-test')).toHaveTextContent('not computable yet');
    expect(screen.getByTestId('contacts-test')).toHaveTextContent(
      "Welch's test: not computable (everyone in a condition had the same number of contacts).",
    );
    expect(screen.getByText(/No reminders, re-consent requests or staff messages have been sent/)).toBeInTheDocument();
  });
});
