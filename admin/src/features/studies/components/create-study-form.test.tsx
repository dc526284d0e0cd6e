import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { CreateStudyForm } from './create-study-form';

const created = {
  id: '5b0c7d2e-3f41-4c8a-9d6e-2a1f0b9c8d71',
  slug: 'lantern-signs',
  title: 'Lantern signs',
  status: 'draft',
  design: 'between',
  protocolNumber: 'HLCL-2027-003',
  summary: '',
  estimatedMinutes: 40,
  targetSize: 120,
  budgetMinor: 250050,
  currency: 'USD',
  blinded: true,
  labName: 'Harbor Lane Cognition Lab',
  contactEmail: 'lantern@harborlane.test',
  openedAt: null,
  closedAt: null,
  createdAt: '2027-01-04T10:00:00.000Z',
  designLocked: false,
  archivedAt: null,
  ethicsApprovalReference: null,
  assignedCount: 0,
  editRules: [],
};

const submit = () => userEvent.click(screen.getByRole('button', { name: 'Create study' }));

describe('CreateStudyForm', () => {
  it('names every missing required field and sends nothing', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<CreateStudyForm onCreated={vi.fn()} onCancel={vi.fn()} />);

    await submit();

    expect(await screen.findByText('Enter a title.')).toBeInTheDocument();
    expect(screen.getByText('Use 3 to 60 characters for the link name.')).toBeInTheDocument();
    expect(screen.getByText('Choose how conditions are compared.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });

  it('suggests the link name from the title and posts the budget in minor units', async () => {
    const { requests } = stubApi({ 'POST /api/studies': { status: 201, body: created } });
    const onCreated = vi.fn();
    renderWithProviders(<CreateStudyForm onCreated={onCreated} onCancel={vi.fn()} />);

    await userEvent.type(screen.getByLabelText('Title'), 'Lantern signs');
    expect(screen.getByLabelText('Link name')).toHaveValue('lantern-signs');
    await userEvent.type(screen.getByLabelText('Protocol reference'), 'HLCL-2027-003');
    await userEvent.click(screen.getByRole('radio', { name: /Between subjects/ }));
    await userEvent.type(screen.getByLabelText('Target number of participants'), '120');
    await userEvent.type(screen.getByLabelText('Estimated minutes per participant'), '40');
    // 2,500.50 USD is 250050 cents; ISO 4217 gives USD two minor digits.
    await userEvent.type(screen.getByLabelText('Budget'), '2,500.50');
    await userEvent.type(screen.getByLabelText('Lab name'), 'Harbor Lane Cognition Lab');
    await userEvent.type(screen.getByLabelText('Contact e-mail'), 'lantern@harborlane.test');
    await submit();

    await waitFor(() => expect(onCreated).toHaveBeenCalledWith(created));
    expect(requests).toEqual([
      expect.objectContaining({
        method: 'POST',
        path: '/api/studies',
        body: {
          slug: 'lantern-signs',
          title: 'Lantern signs',
          design: 'between',
          currency: 'USD',
          blinded: true,
          protocolNumber: 'HLCL-2027-003',
          estimatedMinutes: 40,
          targetSize: 120,
          budgetMinor: 250050,
          labName: 'Harbor Lane Cognition Lab',
          contactEmail: 'lantern@harborlane.test',
        },
      }),
    ]);
  }, 20_000);

  it('refuses a budget with more decimals than the currency has, a bad link name and an unknown currency', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<CreateStudyForm onCreated={vi.fn()} onCancel={vi.fn()} />);

    await userEvent.type(screen.getByLabelText('Title'), 'Lantern signs');
    await userEvent.clear(screen.getByLabelText('Link name'));
    await userEvent.type(screen.getByLabelText('Link name'), 'Lantern Signs');
    await userEvent.click(screen.getByRole('radio', { name: /Within subjects/ }));
    await userEvent.type(screen.getByLabelText('Budget'), '10.005');
    await submit();

    expect(await screen.findByText(/Use lower-case letters and digits/)).toBeInTheDocument();
    expect(screen.getByText('USD amounts have at most 2 digits after the point.')).toBeInTheDocument();

    await userEvent.clear(screen.getByLabelText('Currency'));
    await userEvent.type(screen.getByLabelText('Currency'), 'XY');
    await submit();
    expect(await screen.findByText('Enter a three-letter currency code such as USD or EUR.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });

  it('puts the api’s 409 on the link name and its budget error on the budget field', async () => {
    stubApi({
      'POST /api/studies': {
        status: 409,
        body: {
          statusCode: 409,
          code: 'SLUG_TAKEN',
          message: 'Another study already uses this link name.',
          errors: [{ field: 'slug', message: 'is already taken' }],
        },
      },
    });
    renderWithProviders(<CreateStudyForm onCreated={vi.fn()} onCancel={vi.fn()} />);

    await userEvent.type(screen.getByLabelText('Title'), 'Wayfinding cues');
    await userEvent.click(screen.getByRole('radio', { name: /Between subjects/ }));
    await submit();

    const slug = screen.getByLabelText('Link name');
    await waitFor(() => expect(slug).toHaveAccessibleDescription('is already taken'));
    expect(slug).toHaveAttribute('aria-invalid', 'true');
    expect(slug).toHaveFocus();
  });
});
