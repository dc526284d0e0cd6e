import { act, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { renderWithProviders } from '@/test/render-with-providers';
import { ImportRosterDialog } from './import-roster-dialog';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';

/** Stands in for XMLHttpRequest so the test can drive upload progress and the answer step by step. */
class FakeUpload {
  static last: FakeUpload | null = null;
  method = '';
  url = '';
  withCredentials = false;
  status = 0;
  responseText = '';
  sent: FormData | null = null;
  upload: { onprogress: ((event: ProgressEvent) => void) | null; onload: (() => void) | null } = {
    onprogress: null,
    onload: null,
  };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;

  open(method: string, url: string) {
    this.method = method;
    this.url = url;
    FakeUpload.last = this;
  }
  send(body: FormData) {
    this.sent = body;
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ loaded, total, lengthComputable: true } as ProgressEvent);
  }
  respond(status: number, body: unknown) {
    this.upload.onload?.();
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

afterEach(() => {
  FakeUpload.last = null;
});

const csv = 'email,name,sense_of_direction\nrowan.example@evenhand.test,Rowan Example,64\nnot-an-address,Someone,12\n';

describe('ImportRosterDialog', { timeout: 15_000 }, () => {
  it('uploads the file with a determinate progress bar, then shows the row report', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeUpload);
    renderWithProviders(
      <ImportRosterDialog studyId={studyId} open onClose={vi.fn()} factorKeys={['sense_of_direction']} />,
    );

    await userEvent.upload(
      await screen.findByLabelText('CSV file (up to 5 MB)'),
      new File([csv], 'invitees.csv', { type: 'text/csv' }),
    );
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));

    await waitFor(() => expect(FakeUpload.last?.sent).not.toBeNull());
    const upload = FakeUpload.last!;
    expect(upload.method).toBe('POST');
    expect(upload.url).toMatch(new RegExp(`/api/studies/${studyId}/enrollments/import$`));
    expect(upload.withCredentials).toBe(true);
    const sentFile = upload.sent!.get('file') as File;
    expect(sentFile.name).toBe('invitees.csv');
    expect(await sentFile.text()).toBe(csv);

    act(() => upload.progress(60, 120));
    expect(screen.getByRole('progressbar', { name: 'Uploading' })).toHaveAttribute('aria-valuenow', '50');

    act(() =>
      upload.respond(200, {
        created: 1,
        alreadyEnrolled: 0,
        ignoredColumns: [],
        errors: [{ line: 3, field: 'email', message: '"not-an-address" is not an e-mail address' }],
      }),
    );

    expect(await screen.findByRole('table', { name: 'Problems found, row by row' })).toHaveTextContent(
      '"not-an-address" is not an e-mail address',
    );
    expect(screen.getByText('person added')).toBeInTheDocument();
    expect(screen.queryByRole('progressbar')).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Done' })).toBeInTheDocument();
  });

  it('refuses a spreadsheet file before uploading anything', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeUpload);
    renderWithProviders(<ImportRosterDialog studyId={studyId} open onClose={vi.fn()} />);

    const xlsx = new File(['PK'], 'invitees.xlsx', {
      type: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    });
    await userEvent.upload(await screen.findByLabelText('CSV file (up to 5 MB)'), xlsx, { applyAccept: false });

    expect(await screen.findByText(/invitees\.xlsx is not a CSV file/)).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Import' })).toBeDisabled();
    expect(FakeUpload.last).toBeNull();
  });

  it('shows the api’s refusal of the whole file', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeUpload);
    renderWithProviders(<ImportRosterDialog studyId={studyId} open onClose={vi.fn()} />);

    await userEvent.upload(
      await screen.findByLabelText('CSV file (up to 5 MB)'),
      new File(['a,b\n'], 'odd.csv', { type: 'text/csv' }),
    );
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(FakeUpload.last?.sent).not.toBeNull());
    act(() =>
      FakeUpload.last!.respond(415, {
        statusCode: 415,
        code: 'UNSUPPORTED_MEDIA_TYPE',
        message: 'The roster must be a CSV text file.',
        errors: [{ field: 'file', message: 'is not a text file' }],
      }),
    );

    expect(await screen.findByText('The roster must be a CSV text file.')).toBeInTheDocument();
    expect(screen.getByText('file: is not a text file')).toBeInTheDocument();
  });
});
