import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { OpeningChecklistPanel } from './opening-checklist';

const studyId = '43474abc-f2c2-4790-8e76-1092b9661cd1';

describe('OpeningChecklistPanel', () => {
  it('marks what is done and links each missing item to where it is put right', async () => {
    stubApi({
      [`GET /api/studies/${studyId}/opening-checklist`]: {
        status: 200,
        body: {
          ready: false,
          items: [
            { key: 'conditions', label: 'At least two conditions', met: true, detail: null },
            { key: 'steps', label: 'At least one step', met: false, detail: 'add at least one step' },
            { key: 'consent', label: 'An active consent version', met: false, detail: 'activate a consent version' },
          ],
        },
      },
    });
    renderWithProviders(<OpeningChecklistPanel studyId={studyId} />);

    const list = await screen.findByRole('list', { name: 'Opening checklist' });
    const items = within(list).getAllByRole('listitem');
    expect(items[0]).toHaveTextContent('At least two conditions: done');
    expect(items[1]).toHaveTextContent('At least one step: still needed');
    expect(within(items[1] as HTMLElement).getByRole('link', { name: /Go there/ })).toHaveAttribute(
      'href',
      `/studies/${studyId}/setup#steps`,
    );
    expect(within(items[2] as HTMLElement).getByRole('link', { name: /Go there/ })).toHaveAttribute(
      'href',
      `/studies/${studyId}/consent`,
    );
    expect(screen.getByText('“Open study” above works once each of these is done.')).toBeInTheDocument();
  });
});
