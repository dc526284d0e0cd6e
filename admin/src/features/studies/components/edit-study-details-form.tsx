import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import { formatMinor } from '@/lib/money';
import type { Study } from '../api/get-study';
import {
  changedDetails,
  detailsFormValues,
  studyDetailsSchema,
  useUpdateStudyDetails,
  type StudyDetailsFormValues,
} from '../api/update-study-details';

const formFields = [
  'title',
  'summary',
  'contactEmail',
  'protocolNumber',
  'ethicsApprovalReference',
  'targetSize',
  'budget',
] as const;

export interface EditStudyDetailsFormProps {
  study: Study;
  onSaved: (study: Study) => void;
  onCancel: () => void;
}

/** Title, description, contact, the two references, target and budget; what is fixed after the first assignment says why. */
export function EditStudyDetailsForm({ study, onSaved, onCancel }: EditStudyDetailsFormProps) {
  const updateDetails = useUpdateStudyDetails(study.id);
  const assigned = study.assignedCount;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<StudyDetailsFormValues>({
    resolver: zodResolver(studyDetailsSchema(study)),
    defaultValues: detailsFormValues(study),
  });

  const onSubmit = handleSubmit((values) => {
    const body = changedDetails(study, values);
    if (Object.keys(body).length === 0) {
      onCancel();
      return;
    }
    updateDetails.mutate(body, {
      onSuccess: (saved) => onSaved(saved),
      // The api names budgetMinor; the form calls it budget.
      onError: (error) => applyServerErrors(renameBudget(error), formFields, setError),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Edit study details" className="flex flex-col gap-4">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <Notice tone="info">
        <p className="font-medium">
          {assigned === 0
            ? 'Nobody has been assigned yet, so every detail here may change.'
            : `${assigned} ${assigned === 1 ? 'person has' : 'people have'} been assigned, so some details are now fixed.`}
        </p>
        <ul className="mt-1 list-disc pl-5" aria-label="What may change, and when">
          {study.editRules.map((rule) => (
            <li key={rule}>{rule}</li>
          ))}
        </ul>
      </Notice>
      <TextField label="Title" autoComplete="off" error={errors.title?.message} {...register('title')} />
      <TextAreaField
        label="Description for participants"
        hint="What taking part involves, in plain words. Shown on the study page."
        error={errors.summary?.message}
        {...register('summary')}
      />
      <TextField
        label="Contact e-mail"
        type="email"
        autoComplete="off"
        hint="Where participants can write with questions."
        error={errors.contactEmail?.message}
        {...register('contactEmail')}
      />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Protocol reference"
          autoComplete="off"
          readOnly={assigned > 0}
          hint={
            assigned > 0
              ? 'Fixed: signed consent forms quote it.'
              : 'The lab’s own protocol number, e.g. HLCL-2026-014.'
          }
          error={errors.protocolNumber?.message}
          {...register('protocolNumber')}
        />
        <TextField
          label="Ethics approval reference"
          autoComplete="off"
          hint="The ethics board’s reference on its approval letter, e.g. HLREB-2026-031."
          error={errors.ethicsApprovalReference?.message}
          {...register('ethicsApprovalReference')}
        />
        <TextField
          label="Target number of participants"
          inputMode="numeric"
          hint={assigned > 0 ? `At least ${assigned}, the number already assigned.` : undefined}
          error={errors.targetSize?.message}
          {...register('targetSize')}
        />
        <TextField
          label={`Budget (${study.currency})`}
          inputMode="decimal"
          hint={
            assigned > 0
              ? `May be raised, not lowered below ${formatMinor(study.budgetMinor, study.currency)}.`
              : 'e.g. 6000 or 6,000.00'
          }
          error={errors.budget?.message}
          {...register('budget')}
        />
      </div>
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={updateDetails.isPending}>
          Save details
        </Button>
      </DialogActions>
    </form>
  );
}

function renameBudget(error: unknown): unknown {
  if (error instanceof Error && 'fieldErrors' in error && Array.isArray(error.fieldErrors)) {
    for (const fieldError of error.fieldErrors as Array<{ field: string }>)
      if (fieldError.field === 'budgetMinor') fieldError.field = 'budget';
  }
  return error;
}
