import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  reasonSchemaFor,
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
  {
    title: (who: string) => string;
    description: string;
    confirm: string;
    reasonHint: string;
    tone: 'danger' | 'primary';
  }
> = {
  lost: {
    title: (who) => `Mark ${who} lost to follow-up?`,
    description:
      'Use this when someone stopped responding without withdrawing. They count as dropout for their condition in the dropout watch. Their record, signatures and pay so far are kept.',
    confirm: 'Mark lost to follow-up',
    reasonHint: 'Optional. For example: no reply to three reminders over two weeks.',
    tone: 'danger',
  },
  'undo-lost': {
    title: (who) => `Put ${who} back to taking part?`,
    description:
      'Use this when someone marked lost to follow-up got in touch again or was marked by mistake. They leave the dropout count of their condition and can do their remaining steps. The earlier mark stays in their record’s history.',
    confirm: 'Put back to taking part',
    reasonHint: 'Required, kept in the audit trail. For example: answered the fourth reminder.',
    tone: 'primary',
  },
  withdraw: {
    title: (who) => `Record a withdrawal for ${who}?`,
    description:
      'Use this when the person told you they want to stop. They get a confirmation e-mail and are paid for what they completed. Their record and signatures are kept; nothing is deleted.',
    confirm: 'Record withdrawal',
    reasonHint: 'Optional. Participants never have to give a reason; note one only if they offered it.',
    tone: 'danger',
  },
};

/** What the screen announces after a change went through. */
export function changeAnnouncement(entry: RosterEntry, change: ParticipationChange): string {
  if (change === 'lost') return `${entry.reference} is marked lost to follow-up.`;
  if (change === 'undo-lost') return `${entry.reference} is taking part again.`;
  return `The withdrawal of ${entry.reference} is recorded.`;
}

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
          confirmTone={text.tone}
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
  confirmTone: 'danger' | 'primary';
  reasonHint: string;
  onCancel: () => void;
  onChanged: (entry: RosterEntry, change: ParticipationChange) => void;
}

function ReasonForm({ studyId, target, confirmLabel, confirmTone, reasonHint, onCancel, onChanged }: ReasonFormProps) {
  const changeParticipation = useChangeParticipation(studyId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ParticipationReasonInput>({
    resolver: zodResolver(reasonSchemaFor(target.change)),
    mode: 'onTouched',
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
        <Button type="submit" variant={confirmTone} pending={changeParticipation.isPending}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </form>
  );
}
