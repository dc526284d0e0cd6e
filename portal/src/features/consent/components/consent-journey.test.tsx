import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { stubCanvas } from '@/test/canvas-stub';
import { installFakeApi, participant } from '@/test/fake-api';
import { consentToSign, enrollment, publicStudy, studyId } from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

function atConsent(next: 'consent' | 're-consent' = 'consent', changesSinceSigned: string[] = []) {
  return installFakeApi({
    'GET /api/auth/me': { status: 200, body: participant },
    'GET /api/public/studies/wayfinding-cues': { status: 200, body: publicStudy },
    [`GET /api/studies/${studyId}/enrollments/me`]: { status: 200, body: enrollment({ status: 'screened', next }) },
    [`GET /api/studies/${studyId}/enrollments/me/consent`]: {
      status: 200,
      body: consentToSign({ changesSinceSigned }),
    },
  });
}

beforeEach(() => stubCanvas());

describe('reading the consent form', () => {
  it('shows the key information first on its own, then the full form section by section, back and forth', async () => {
    const user = userEvent.setup();
    atConsent();
    renderApp('/s/wayfinding-cues');

    // The first render also loads the route's code, which can take a moment.
    expect(await screen.findByRole('heading', { name: 'Key information' }, { timeout: 3_000 })).toBeInTheDocument();
    expect(screen.getByText('Start here: the key points')).toBeInTheDocument();
    expect(screen.getByText(/pays up to \$37\.50/)).toBeInTheDocument();
    expect(screen.getByText('Part 1 of 4')).toBeInTheDocument();
    expect(screen.getByText('About 6 minutes to read in all')).toBeInTheDocument();
    expect(screen.getByRole('progressbar', { name: 'How far you have read' })).toHaveAttribute(
      'aria-valuetext',
      'Part 1 of 4',
    );
    expect(
      screen.getByText(/Ask the research team or the ethics board named in the form before you sign/),
    ).toBeInTheDocument();
    expect(screen.getByText(/You can stop and come back later/)).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Back' })).not.toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: 'Read the full form' }));
    // The key information section is the same text, so the full form goes on with the next section.
    expect(screen.getByRole('heading', { name: 'Why we are doing this study' })).toHaveFocus();
    expect(screen.getByText('Part 2 of 4')).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: 'Back' }));
    expect(screen.getByRole('heading', { name: 'Key information' })).toHaveFocus();

    await user.click(screen.getByRole('button', { name: 'Read the full form' }));
    await user.click(screen.getByRole('button', { name: 'Next: Risks and discomforts' }));
    await user.click(screen.getByRole('button', { name: 'Next: Questions' }));
    expect(screen.getByText(/Harbor Lane Research Ethics Board/)).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Continue to signing' }));

    expect(screen.getByRole('heading', { name: 'Sign the consent form' })).toHaveFocus();
    expect(screen.getByText(/Ask the research team or the ethics board named in the form/)).toBeInTheDocument();
  });

  it('picks up at the same section after the page is reloaded', async () => {
    const user = userEvent.setup();
    atConsent();
    const first = renderApp('/s/wayfinding-cues');
    await user.click(await screen.findByRole('button', { name: 'Read the full form' }, { timeout: 3_000 }));
    await user.click(screen.getByRole('button', { name: 'Next: Risks and discomforts' }));
    first.unmount();

    renderApp('/s/wayfinding-cues');

    expect(await screen.findByRole('heading', { name: 'Risks and discomforts' })).toBeInTheDocument();
    expect(screen.getByText('Part 3 of 4')).toBeInTheDocument();
  });

  it('asks someone who signed before to read and sign the new version, instead of showing their steps', async () => {
    atConsent('re-consent');
    renderApp('/s/wayfinding-cues');

    expect(await screen.findByText('The consent form has changed', {}, { timeout: 3_000 })).toBeInTheDocument();
    expect(screen.getByText(/Please read it and sign it again before your next step/)).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'Key information' })).toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: 'Your steps' })).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Stop taking part' })).toBeInTheDocument();
  });

  it('tells someone asked to sign again what changed since the version they signed', async () => {
    atConsent('re-consent', [
      'Pay for “Session 2: test town” changed from $15.00 to $18.00.',
      'New section: “Sharing results with you”.',
    ]);
    renderApp('/s/wayfinding-cues');

    const heading = await screen.findByText('What changed since you signed:', {}, { timeout: 3_000 });
    const changes = within(heading.parentElement as HTMLElement)
      .getAllByRole('listitem')
      .map((item) => item.textContent);
    expect(changes).toEqual([
      'Pay for “Session 2: test town” changed from $15.00 to $18.00.',
      'New section: “Sharing results with you”.',
    ]);
  });

  it('says so and offers to try again when the form cannot be loaded', async () => {
    const user = userEvent.setup();
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      'GET /api/public/studies/wayfinding-cues': { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: { status: 200, body: enrollment({ next: 'consent' }) },
      [`GET /api/studies/${studyId}/enrollments/me/consent`]: (_request, call) =>
        call === 1
          ? { status: 503, body: { statusCode: 503, code: 'INTERNAL', message: 'Database unavailable' } }
          : { status: 200, body: consentToSign() },
    });
    renderApp('/s/wayfinding-cues');

    expect(await screen.findByText('We could not open the consent form', {}, { timeout: 3_000 })).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Try again' }));
    expect(await screen.findByRole('heading', { name: 'Key information' })).toBeInTheDocument();
  });
});
