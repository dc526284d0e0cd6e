import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useInviteParticipants } from '../api/invite-participants';
import { useSendReconsentReminders } from '../api/send-reconsent-reminders';

export type RosterMailing = 'invitations' | 'reconsent-reminders';

export interface RosterMailDialogProps {
  studyId: string;
  mailing: RosterMailing | null;
  /** How many people need to re-consent, for the reminder's wording. */
  reconsentCount: number;
  onClose: () => void;
  onSent: (mailing: RosterMailing, count: number) => void;
}

/** Asks before e-mailing many people at once, then reports how many were sent. */
export function RosterMailDialog({ studyId, mailing, reconsentCount, onClose, onSent }: RosterMailDialogProps) {
  const invite = useInviteParticipants(studyId);
  const remind = useSendReconsentReminders(studyId);
  const [shown, setShown] = useState(mailing);
  if (mailing !== null && mailing !== shown) setShown(mailing);
  const current = mailing ?? shown;
  const mutation = current === 'reconsent-reminders' ? remind : invite;

  const close = () => {
    invite.reset();
    remind.reset();
    onClose();
  };
  const send = () => {
    const done = (count: number) => {
      invite.reset();
      remind.reset();
      onSent(current ?? 'invitations', count);
    };
    if (current === 'reconsent-reminders') remind.mutate(undefined, { onSuccess: done });
    else invite.mutate(undefined, { onSuccess: done });
  };

  const invitations = current !== 'reconsent-reminders';
  return (
    <ModalDialog
      open={mailing !== null}
      onClose={close}
      role="alertdialog"
      title={invitations ? 'Send invitations?' : 'Remind to re-consent?'}
      description={
        invitations
          ? 'Everyone on the roster who has not had an invitation yet gets one e-mail with a link to the study page. People already invited are not e-mailed again.'
          : `${reconsentCount} ${reconsentCount === 1 ? 'person has' : 'people have'} not yet signed the newest consent version. Each gets one e-mail asking them to read and sign it before their next step.`
      }
    >
      {mutation.isError && (
        <Notice>
          {mutation.error instanceof ApiError ? mutation.error.message : 'The e-mails could not be sent. Try again.'}
        </Notice>
      )}
      <DialogActions>
        <Button onClick={close}>Cancel</Button>
        <Button variant="primary" pending={mutation.isPending} onClick={send}>
          {invitations ? 'Send invitations' : 'Send reminders'}
        </Button>
      </DialogActions>
    </ModalDialog>
  );
}
