import { Description, Dialog, DialogBackdrop, DialogPanel, DialogTitle } from '@headlessui/react';
import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { DialogActions } from '@/components/ui/modal-dialog';
import { dialogRecipe } from '@/components/ui/recipes';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useImportRoster, type ImportProgress as Progress } from '../api/import-roster';
import { formatFileSize } from '../utils/file-size';
import { rosterFileProblem } from '../utils/roster-file-checks';
import { ImportProgress } from './import-progress';
import { ImportReport } from './import-report';

const fileInputClass =
  'block w-full text-sm text-ink-muted file:mr-3 file:h-8 file:cursor-pointer file:rounded-md file:border file:border-line-strong file:bg-surface file:px-3 file:text-sm file:font-medium file:text-ink hover:file:bg-sunken';

export interface ImportRosterDialogProps {
  studyId: string;
  open: boolean;
  onClose: () => void;
  /** The study's pretest columns (stratification factor keys), when known. */
  factorKeys?: readonly string[];
}

/** Give it a new `key` each time it opens, so each import starts afresh. */
export function ImportRosterDialog({ studyId, open, onClose, factorKeys = [] }: ImportRosterDialogProps) {
  const importRoster = useImportRoster(studyId);
  const inputId = useId();
  const problemId = useId();
  const [file, setFile] = useState<File | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [progress, setProgress] = useState<Progress | null>(null);

  const choose = (chosen: File | undefined) => {
    importRoster.reset();
    setProgress(null);
    setFile(chosen ?? null);
    setProblem(chosen ? rosterFileProblem(chosen) : null);
  };

  const start = () => {
    if (!file) {
      setProblem('Choose the CSV file to import.');
      return;
    }
    if (problem) return;
    setProgress({ stage: 'reading', loaded: 0, total: file.size });
    importRoster.mutate({ file, onProgress: setProgress }, { onSettled: () => setProgress(null) });
  };

  const columns = ['email', 'name', ...factorKeys];
  const busy = importRoster.isPending;

  return (
    <Dialog open={open} onClose={() => !busy && onClose()} transition className="relative z-50">
      <DialogBackdrop transition className={dialogRecipe.backdrop} />
      <div className={cx(dialogRecipe.frame, 'pt-[8vh]!')}>
        <DialogPanel transition className={cx(dialogRecipe.panel, 'max-w-2xl!')}>
          <div className="border-b border-line px-5 pt-4 pb-3">
            <DialogTitle className={dialogRecipe.title}>Import invitees from a CSV file</DialogTitle>
            <Description as="div" className={dialogRecipe.description}>
              One person per row, with a header row naming the columns:{' '}
              {columns.map((column, index) => (
                <span key={column}>
                  {index > 0 && ', '}
                  <code className="font-mono text-xs text-ink">{column}</code>
                </span>
              ))}
              {factorKeys.length === 0 && ' and one column per pretest question'}. Only e-mail is required; pretest
              answers left out are asked at screening. Nobody is e-mailed until you send invitations.
            </Description>
          </div>
          <div className="flex flex-col gap-4 px-5 py-4">
            {!importRoster.isSuccess && (
              <div className="flex flex-col gap-1">
                <label htmlFor={inputId} className="text-xs font-semibold text-ink">
                  CSV file (up to 5 MB)
                </label>
                <input
                  id={inputId}
                  type="file"
                  accept=".csv,text/csv"
                  disabled={busy}
                  aria-invalid={problem ? true : undefined}
                  aria-describedby={problemId}
                  className={fileInputClass}
                  onChange={(event) => choose(event.target.files?.[0])}
                />
                <p
                  id={problemId}
                  aria-live="polite"
                  className={problem ? 'text-xs font-medium text-danger' : 'text-xs text-ink-faint'}
                >
                  {problem ?? (file ? `${file.name} · ${formatFileSize(file.size)}` : '')}
                </p>
              </div>
            )}
            <div aria-live="polite" className="flex flex-col gap-3 empty:hidden">
              {busy && progress && <ImportProgress progress={progress} />}
              {importRoster.isError && (
                <Notice>
                  <p className="font-medium">
                    {importRoster.error instanceof ApiError
                      ? importRoster.error.message
                      : 'The file could not be imported. Try again.'}
                  </p>
                  {importRoster.error instanceof ApiError && importRoster.error.fieldErrors.length > 0 && (
                    <ul className="mt-1 list-disc pl-5">
                      {importRoster.error.fieldErrors.map((fieldError, index) => (
                        <li key={`${fieldError.field}-${index}`}>
                          {fieldError.field}: {fieldError.message}
                        </li>
                      ))}
                    </ul>
                  )}
                </Notice>
              )}
              {importRoster.isSuccess && <ImportReport result={importRoster.data} fileName={file?.name} />}
            </div>
            <DialogActions>
              {importRoster.isSuccess ? (
                <>
                  <Button onClick={() => choose(undefined)}>Import another file</Button>
                  <Button variant="primary" onClick={onClose}>
                    Done
                  </Button>
                </>
              ) : (
                <>
                  <Button onClick={onClose} disabled={busy}>
                    Cancel
                  </Button>
                  <Button variant="primary" onClick={start} pending={busy} disabled={!file || Boolean(problem)}>
                    Import
                  </Button>
                </>
              )}
            </DialogActions>
          </div>
        </DialogPanel>
      </div>
    </Dialog>
  );
}
