import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { failingCheck } from '../test/consent-fixtures';
import { DraftFindings } from './draft-findings';

describe('DraftFindings', { timeout: 15_000 }, () => {
  it('lists each finding with its citation and message, in the api’s order', () => {
    render(<DraftFindings check={failingCheck} onJumpToLine={vi.fn()} />);

    expect(
      screen.getByText('1 problem with required elements and 1 placeholder still to fill. Fix them before activation.'),
    ).toBeInTheDocument();
    const items = within(screen.getByRole('list', { name: 'Findings' })).getAllByRole('listitem');
    expect(items).toHaveLength(2);
    // 45 CFR 46.116(b)(2): reasonably foreseeable risks or discomforts.
    expect(items[0]).toHaveTextContent('45 CFR 46.116(b)(2)');
    expect(items[0]).toHaveTextContent('Foreseeable risks and discomforts (45 CFR 46.116(b)(2)) is missing.');
    expect(items[1]).toHaveTextContent('To fill');
    expect(items[1]).toHaveTextContent('Line 8 still says "[to fill: institution]"');
  });

  it('makes only findings with a line into buttons and reports the line when clicked', async () => {
    const onJumpToLine = vi.fn();
    render(<DraftFindings check={failingCheck} onJumpToLine={onJumpToLine} />);

    const items = within(screen.getByRole('list', { name: 'Findings' })).getAllByRole('listitem');
    expect(within(items[0]!).queryByRole('button')).not.toBeInTheDocument();
    const jump = within(items[1]!).getByRole('button', { name: /Go to line 8 in the text/ });

    await userEvent.click(jump);
    expect(onJumpToLine).toHaveBeenCalledWith(8);
  });

  it('says so when every element is present, and warns when the text changed since', () => {
    render(<DraftFindings check={{ passes: true, findings: [], required: [], optional: [] }} stale />);

    expect(
      screen.getByText('Every required element is present, and no placeholder is left to fill.'),
    ).toBeInTheDocument();
    expect(screen.getByText(/The text has changed since this check/)).toBeInTheDocument();
    expect(screen.queryByRole('list', { name: 'Findings' })).not.toBeInTheDocument();
  });

  it('shows which required elements the check found', () => {
    render(<DraftFindings check={failingCheck} />);
    expect(screen.getByText('Key information', { exact: false }).closest('li')).toHaveTextContent(
      'Key information 45 CFR 46.116(a)(5)(i): present',
    );
    expect(
      screen.getByText('Foreseeable risks and discomforts', { selector: 'li > span' }).closest('li'),
    ).toHaveTextContent(': missing');
  });
});
