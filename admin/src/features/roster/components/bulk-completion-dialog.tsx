import { zodResolver } from '@hookform/resolvers/zod';
import { useId, useState } from 'react';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  stepListInputSchema,
  useCompleteStepList,
  type StepListFormValues,
  type StepListInput,
} from '../api/complete-step-list';
import { formatFileSize } from '../utils/file-size';
import { parseReferenceList } from '../utils/reference-list';
import { BulkCompletionReport } from './bulk-completion-report';

/** A step as the roster offers it for marking done from a list. */
export interface ListableStep {
  id: string;
  position: number;
  title: string;
}

const maxListBytes = 1024 * 1024;

const fileInputClass =
  'block w-full text-sm text-ink-muted file:mr-3 file:h-8 file:cursor-pointer file:rounded-md file:border file:border-line-strong file:bg-surface file:px-3 file:text-sm file:font-medium file:text-ink hover:file:bg-sunken focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce';

/** Why this file cannot be a list of references, or null. */
export function referenceFileProblem(file: { name: string; size: number }): string | null {
  if (!/\.(csv|txt|tsv)$/i.test(file.name))
    return `${file.name} is not a text or CSV file. Save the list as .csv or .txt and choose that file.`;
  if (file.size === 0) return `${file.name} is empty.`;
  if (file.size > maxListBytes)
    return `${file.name} is larger than 1 MB; a list of references is far smaller. Check you chose the right file.`;
  return null;
}

function readText(file: File): Promise<string> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(String(reader.result ?? ''));
    reader.onerror = () => reject(new Error(`The file ${file.name} could not be read. Choose it again.`));
    reader.readAsText(file);
  });
}

export interface BulkCompletionDialogProps {
  studyId: string;
  steps: readonly ListableStep[];
  open: boolean;
  onClose: () => void;
}

/** Give it a new `key` each time it opens, so each list starts afresh. */
export function BulkCompletionDialog({ studyId, steps, open, onClose }: BulkCompletionDialogProps) {
  const completeList = useCompleteStepList(studyId);
  const fileId = useId();
  const fileNoteId = useId();
  const [fileNote, setFileNote] = useState<{ text: string; problem: boolean } | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    formState: { errors },
  } = useForm<StepListFormValues, unknown, StepListInput>({
    resolver: zodResolver(stepListInputSchema),
    defaultValues: { stepId: steps.length === 1 ? steps[0]?.id : undefined, references: '' },
  });

  const chooseFile = async (file: File | undefined) => {
    setFileNote(null);
    if (!file) return;
    const problem = referenceFileProblem(file);
    if (problem) {
      setFileNote({ text: problem, problem: true });
      return;
    }
    try {
      const references = parseReferenceList(await readText(file));
      if (references.length === 0) {
        setFileNote({ text: `${file.name} has no references in its first column.`, problem: true });
        return;
      }
      setValue('references', references.join('\n'), { shouldValidate: true });
      setFileNote({
        text: `${file.name} · ${formatFileSize(file.size)}: ${references.length} ${references.length === 1 ? 'reference' : 'references'} from the first column, shown below.`,
        problem: false,
      });
    } catch (error) {
      setFileNote({ text: error instanceof Error ? error.message : 'The file could not be read.', problem: true });
    }
  };

  const onSubmit = handleSubmit((input) =>
    completeList.mutate(input, {
      onError: (error) =>
        applyServerErrors(
          // The api names the list `references` and the path's step `stepId`; both are fields here.
          error,
          ['stepId', 'references'],
          setError,
        ),
    }),
  );

  const listed = parseReferenceList(useWatch({ control, name: 'references' }) ?? '').length;
  const chosenStep = steps.find((step) => step.id === completeList.variables?.stepId);
  const busy = completeList.isPending;

  return (
    <ModalDialog
      open={open}
      onClose={() => !busy && onClose()}
      size="wide"
      title="Mark a step done for a list"
      description="For sessions held in the lab: paste the references of everyone who took part, one per line, or choose a text or CSV file whose first column holds them. Each person is owed the step’s pay."
    >
      {completeList.isSuccess ? (
        <>
          <BulkCompletionReport
            result={completeList.data}
            stepTitle={chosenStep ? `Step ${chosenStep.position}: ${chosenStep.title}` : 'The step'}
          />
          <DialogActions>
            <Button
              onClick={() => {
                completeList.reset();
                setValue('references', '');
                setFileNote(null);
              }}
            >
              Mark another list
            </Button>
            <Button variant="primary" onClick={onClose}>
              Done
            </Button>
          </DialogActions>
        </>
      ) : (
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label="Mark a step done for a list">
          {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
          {steps.length === 0 ? (
            <Notice tone="info">The study has no steps yet.</Notice>
          ) : (
            <Controller
              control={control}
              name="stepId"
              render={({ field }) => (
                <SelectField
                  label="Step"
                  value={field.value}
                  onChange={field.onChange}
                  onBlur={field.onBlur}
                  buttonRef={field.ref}
                  placeholder="Choose the step…"
                  options={steps.map((step) => ({ value: step.id, label: `Step ${step.position}: ${step.title}` }))}
                  error={errors.stepId?.message}
                />
              )}
            />
          )}
          <div className="flex flex-col gap-1">
            <label htmlFor={fileId} className="text-xs font-semibold text-ink">
              Or read the references from a file (.csv or .txt, first column)
            </label>
            <input
              id={fileId}
              type="file"
              accept=".csv,.txt,.tsv,text/csv,text/plain"
              disabled={busy}
              aria-describedby={fileNoteId}
              aria-invalid={fileNote?.problem ? true : undefined}
              className={fileInputClass}
              onChange={(event) => void chooseFile(event.target.files?.[0])}
            />
            <p
              id={fileNoteId}
              aria-live="polite"
              className={fileNote?.problem ? 'text-xs font-medium text-danger' : 'text-xs text-ink-muted'}
            >
              {fileNote?.text ?? ''}
            </p>
          </div>
          <TextAreaField
            label="Participant references, one per line"
            rows={8}
            spellCheck={false}
            autoComplete="off"
            placeholder={'P-7KQ2MX\nP-3X66FX'}
            hint={
              listed > 0
                ? `${listed} ${listed === 1 ? 'reference' : 'references'} listed.`
                : 'A header row such as “reference” is skipped.'
            }
            error={errors.references?.message}
            className="font-mono"
            {...register('references')}
          />
          <DialogActions>
            <Button onClick={onClose} disabled={busy}>
              Cancel
            </Button>
            <Button type="submit" variant="primary" pending={busy} disabled={steps.length === 0}>
              Mark done
            </Button>
          </DialogActions>
        </form>
      )}
    </ModalDialog>
  );
}
