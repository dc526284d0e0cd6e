import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import { undoCompletionInputSchema, useUndoCompletion, type UndoCompletionInput } from '../api/undo-completion';

export interface UndoTarget {
  stepId: string;
  position: number;
  title: string;
}

export interface UndoCompletionDialogProps {
  studyId: string;
  enrollmentId: string;
  reference: string;
  target: UndoTarget | null;
  onClose: () => void;
  onUndone: (target: UndoTarget) => void;
}

export function UndoCompletionDialog({
  studyId,
  enrollmentId,
  reference,
  target,
  onClose,
  onUndone,
}: UndoCompletionDialogProps) {
  // Keep showing the step while the dialog fades out.
  const [shown, setShown] = useState(target);
  if (target !== null && target !== shown) setShown(target);
  const current = target ?? shown;
  return (
    <ModalDialog
      open={target !== null}
      onClose={onClose}
      role="alertdialog"
      title={current ? `Undo step ${current.position} for ${reference}?` : 'Undo the step?'}
      description="The step counts as not done again and its pay, not yet approved, is cancelled. The completion stays in the record as undone, with your reason."
    >
      {current && (
        <UndoForm
          key={current.stepId}
          studyId={studyId}
          enrollmentId={enrollmentId}
          target={current}
          onCancel={onClose}
          onUndone={onUndone}
        />
      )}
    </ModalDialog>
  );
}

function UndoForm({
  studyId,
  enrollmentId,
  target,
  onCancel,
  onUndone,
}: {
  studyId: string;
  enrollmentId: string;
  target: UndoTarget;
  onCancel: () => void;
  onUndone: (target: UndoTarget) => void;
}) {
  const undo = useUndoCompletion(studyId, enrollmentId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<UndoCompletionInput>({ resolver: zodResolver(undoCompletionInputSchema), defaultValues: { reason: '' } });

  const onSubmit = handleSubmit(({ reason }) =>
    undo.mutate(
      { stepId: target.stepId, reason },
      { onSuccess: () => onUndone(target), onError: (error) => applyServerErrors(error, ['reason'], setError) },
    ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label={`Undo step ${target.position}`}>
      <p className="text-sm font-medium">
        Step {target.position}: {target.title}
      </p>
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextAreaField
        label="Reason (required)"
        hint="For example: marked for the wrong person; the session did not take place. Kept in the audit trail."
        error={errors.reason?.message}
        rows={3}
        {...register('reason')}
      />
      <DialogActions>
        <Button onClick={onCancel}>Keep it done</Button>
        <Button type="submit" variant="danger" pending={undo.isPending}>
          Undo the step
        </Button>
      </DialogActions>
    </form>
  );
}
