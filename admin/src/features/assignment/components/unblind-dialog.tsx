import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { CheckboxField } from '@/components/ui/checkbox-field';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { unblindInputSchema, useUnblindStudy, type UnblindFormValues, type UnblindInput } from '../api/unblind-study';

export interface UnblindDialogProps {
  studyId: string;
  open: boolean;
  onClose: () => void;
  onUnblinded: () => void;
}

/** Unblinding needs a recorded reason and an explicit confirmation; it cannot be taken back. */
export function UnblindDialog({ studyId, open, onClose, onUnblinded }: UnblindDialogProps) {
  const unblind = useUnblindStudy(studyId);
  const {
    register,
    control,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm<UnblindFormValues, unknown, UnblindInput>({
    resolver: zodResolver(unblindInputSchema),
    defaultValues: { reason: '', confirmed: false },
  });

  const close = () => {
    unblind.reset();
    reset();
    onClose();
  };

  const onSubmit = handleSubmit(({ reason }) => {
    unblind.mutate(reason, {
      onSuccess: () => {
        reset();
        onUnblinded();
      },
      onError: (error) => applyApiFieldErrors(error, setError, (field) => (field === 'reason' ? 'reason' : null)),
    });
  });

  return (
    <ModalDialog
      open={open}
      onClose={close}
      role="alertdialog"
      title="Unblind this study?"
      description="The secret seed is revealed and the study team sees which condition every participant is in. This is recorded in the audit trail with your name and reason, and cannot be undone."
    >
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label="Unblind the study">
        {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
        <TextAreaField
          label="Reason"
          hint="At least 10 characters, e.g. “Data collection finished; analysis plan registered on 12 March.”"
          error={errors.reason?.message}
          {...register('reason')}
        />
        <Controller
          control={control}
          name="confirmed"
          render={({ field, fieldState }) => (
            <CheckboxField
              label="I understand this reveals every assignment and is recorded in the audit trail."
              checked={field.value}
              onChange={field.onChange}
              error={fieldState.error?.message}
            />
          )}
        />
        <DialogActions>
          <Button onClick={close}>Cancel</Button>
          <Button type="submit" variant="danger" pending={unblind.isPending}>
            Unblind and reveal the seed
          </Button>
        </DialogActions>
      </form>
    </ModalDialog>
  );
}
