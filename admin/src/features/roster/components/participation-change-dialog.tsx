import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  participationReasonInputSchema,
  useChangeParticipation,
  type ParticipationChange,
  type ParticipationReasonInput,
} from '../api/change-participation';
import type { RosterEntry } from '../api/get-roster';

export interface ParticipationChangeTarget {
  change: ParticipationChange;
  entry: RosterEntry;
}

const wording: Record<
  ParticipationChange,
  { title: (who: string) => string; description: string; confirm: string; reasonHint: string }
> = {
  lost: {
    title: (who) => `Mark ${who} lost to follow-up?`,
    description:
      'Use this when someone stopped responding without withdrawing. They count as dropout for their condition in the dropout watch. Their record, signatures and pay so far are kept.',
    confirm: 'Mark lost to follow-up',
    reasonHint: 'Optional. For example: no reply to three reminders over two weeks.',
  },
  withdraw: {
    title: (who) => `Record a withdrawal for ${who}?`,
    description:
      'Use this when the person told you they want to stop. They get a confirmation e-mail and are paid for what they completed. Their record and signatures are kept; nothing is deleted.',
    confirm: 'Record withdrawal',
    reasonHint: 'Optional. Participants never have to give a reason; note one only if they offered it.',
  },
};

export interface ParticipationChangeDialogProps {
  studyId: string;
  target: ParticipationChangeTarget | null;
  onClose: () => void;
  onChanged: (entry: RosterEntry, change: ParticipationChange) => void;
}

export function ParticipationChangeDialog({ studyId, target, onClose, onChanged }: ParticipationChangeDialogProps) {
  // Keep showing the last person while the dialog fades out.
  const [shown, setShown] = useState(target);
  if (target !== null && target !== shown) setShown(target);
  const current = target ?? shown;
  const text = wording[current?.change ?? 'lost'];
  const who = current ? (current.entry.name ?? current.entry.reference) : '';

  return (
    <ModalDialog
      open={target !== null}
      onClose={onClose}
      role="alertdialog"
      title={text.title(who)}
      description={text.description}
    >
      {current && (
        <ReasonForm
          key={`${current.change}-${current.entry.id}`}
          studyId={studyId}
          target={current}
          confirmLabel={text.confirm}
          reasonHint={text.reasonHint}
          onCancel={onClose}
          onChanged={onChanged}
        />
      )}
    </ModalDialog>
  );
}

interface ReasonFormProps {
  studyId: string;
  target: ParticipationChangeTarget;
  confirmLabel: string;
  reasonHint: string;
  onCancel: () => void;
  onChanged: (entry: RosterEntry, change: ParticipationChange) => void;
}

function ReasonForm({ studyId, target, confirmLabel, reasonHint, onCancel, onChanged }: ReasonFormProps) {
  const changeParticipation = useChangeParticipation(studyId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ParticipationReasonInput>({
    resolver: zodResolver(participationReasonInputSchema),
    defaultValues: { reason: '' },
  });

  const onSubmit = handleSubmit(({ reason }) =>
    changeParticipation.mutate(
      { change: target.change, enrollmentId: target.entry.id, reason },
      {
        onSuccess: (entry) => onChanged(entry, target.change),
        onError: (error) => applyServerErrors(error, ['reason'], setError),
      },
    ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label={confirmLabel}>
      <p className="text-sm text-ink-muted">
        {target.entry.reference} · {target.entry.email}
      </p>
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextAreaField label="Reason" hint={reasonHint} error={errors.reason?.message} rows={3} {...register('reason')} />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="danger" pending={changeParticipation.isPending}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </form>
  );
}
