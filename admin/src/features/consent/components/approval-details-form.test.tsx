import { fireEvent, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { draftVersion, studyId } from '../test/consent-fixtures';
import { localToday } from '../utils/calendar-date';
import { ApprovalDetailsForm } from './approval-details-form';

const version = draftVersion({ approvalReference: null, approvedAt: null });

function dayAfterTomorrow(): string {
  const later = new Date();
  later.setDate(later.getDate() + 2);
  return localToday(later);
}

describe('ApprovalDetailsForm', () => {
  it('says a future approval date is wrong as soon as the field is left, before anything is sent', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<ApprovalDetailsForm studyId={studyId} version={version} />);

    const date = screen.getByLabelText('Approval date');
    // jsdom's date input takes a typed value only whole, as a browser's date picker hands it over.
    fireEvent.change(date, { target: { value: dayAfterTomorrow() } });
    fireEvent.blur(date);

    expect(
      await screen.findByText('The approval date cannot be in the future: enter the date printed on the letter.'),
    ).toBeInTheDocument();
    expect(date).toHaveAttribute('aria-invalid', 'true');
    expect(requests).toEqual([]);
  });

  it('takes today’s date', async () => {
    const { requests } = stubApi({
      [`PATCH /api/studies/${studyId}/consent-versions/${version.id}`]: ({ body }) => ({
        status: 200,
        body: { ...version, ...(body as object) },
      }),
    });
    renderWithProviders(<ApprovalDetailsForm studyId={studyId} version={version} />);

    await userEvent.type(screen.getByLabelText('Approval reference'), 'HLREB-2026-031');
    const date = screen.getByLabelText('Approval date');
    fireEvent.change(date, { target: { value: localToday() } });
    fireEvent.blur(date);
    await userEvent.click(screen.getByRole('button', { name: 'Save approval details' }));

    expect(await screen.findByText('Approval details saved.')).toBeInTheDocument();
    expect(requests[0]?.body).toEqual({ approvalReference: 'HLREB-2026-031', approvedAt: localToday() });
    expect(screen.queryByText(/cannot be in the future/)).not.toBeInTheDocument();
  });
});
