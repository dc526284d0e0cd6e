import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { useRemoveMembership } from '../api/change-membership';
import { membershipErrorMessage } from './membership-labels';

export interface MembershipToRemove {
  studyId: string;
  studyTitle: string;
  userId: string;
  personName: string;
}

export interface RemoveMembershipDialogProps {
  /** What to remove; null keeps the dialog closed. */
  membership: MembershipToRemove | null;
  onClose: () => void;
  onRemoved: (membership: MembershipToRemove) => void;
}

export function RemoveMembershipDialog({ membership, onClose, onRemoved }: RemoveMembershipDialogProps) {
  const removeMembership = useRemoveMembership();
  // Keep the names on screen while the dialog fades out.
  const [shown, setShown] = useState<MembershipToRemove | null>(membership);
  if (membership !== null && membership !== shown) setShown(membership);
  const target = membership ?? shown;

  const close = () => {
    removeMembership.reset();
    onClose();
  };

  const confirm = () => {
    if (!membership) return;
    removeMembership.mutate(membership, {
      onSuccess: () => {
        removeMembership.reset();
        onRemoved(membership);
      },
    });
  };

  return (
    <ModalDialog
      open={membership !== null}
      onClose={close}
      role="alertdialog"
      title={`Remove ${target?.personName ?? ''} from ${target?.studyTitle ?? ''}?`}
      description="They stop seeing the study at once. What they did in it stays in its audit trail, and an admin can add them again later."
    >
      {removeMembership.isError && (
        <Notice>
          {membershipErrorMessage(removeMembership.error, 'The membership could not be removed. Try again.')}
        </Notice>
      )}
      <DialogActions>
        <Button onClick={close}>Cancel</Button>
        <Button variant="danger" pending={removeMembership.isPending} onClick={confirm}>
          Remove from study
        </Button>
      </DialogActions>
    </ModalDialog>
  );
}
