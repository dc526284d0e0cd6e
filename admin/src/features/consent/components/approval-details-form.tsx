import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import type { ConsentVersion } from '../api/get-consent-versions';
import {
  approvalDetailsInputSchema,
  useUpdateConsentDraft,
  type ApprovalDetailsInput,
} from '../api/update-consent-draft';

const formFields = ['approvalReference', 'approvedAt'] as const;

export function ApprovalDetailsForm({ studyId, version }: { studyId: string; version: ConsentVersion }) {
  const update = useUpdateConsentDraft(studyId, version.id);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isDirty },
  } = useForm<ApprovalDetailsInput>({
    resolver: zodResolver(approvalDetailsInputSchema),
    // A wrong date shows as soon as the field is left, not only after saving.
    mode: 'onTouched',
    defaultValues: { approvalReference: version.approvalReference ?? '', approvedAt: version.approvedAt ?? '' },
  });

  const onSubmit = handleSubmit((details) => {
    setSaved(false);
    update.mutate(details, {
      onSuccess: (changed) => {
        reset({ approvalReference: changed.approvalReference ?? '', approvedAt: changed.approvedAt ?? '' });
        setSaved(true);
      },
      onError: (error) => applyServerErrors(error, formFields, setError),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Ethics approval details" className="flex flex-col gap-3">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          label="Approval reference"
          hint="As printed on the ethics board’s letter."
          autoComplete="off"
          error={errors.approvalReference?.message}
          {...register('approvalReference')}
        />
        <TextField
          label="Approval date"
          type="date"
          hint="The date on the letter."
          error={errors.approvedAt?.message}
          {...register('approvedAt')}
        />
      </div>
      <div className="flex items-center gap-3">
        <Button type="submit" pending={update.isPending} disabled={!isDirty}>
          Save approval details
        </Button>
        <p aria-live="polite" className="text-xs text-success">
          {saved && !isDirty ? 'Approval details saved.' : ''}
        </p>
      </div>
    </form>
  );
}
