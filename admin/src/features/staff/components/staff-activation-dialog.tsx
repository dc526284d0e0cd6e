import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import type { StaffUser } from '../api/get-staff-users';
import { useUpdateStaffUser } from '../api/update-staff-user';

export interface StaffActivationDialogProps {
  /** The person to deactivate (when active) or reactivate (when not); null keeps the dialog closed. */
  user: StaffUser | null;
  onClose: () => void;
  onChanged: (user: StaffUser) => void;
}

export function StaffActivationDialog({ user, onClose, onChanged }: StaffActivationDialogProps) {
  const updateStaffUser = useUpdateStaffUser();
  // Keep showing the last person while the dialog fades out, instead of a blank name.
  const [shown, setShown] = useState<StaffUser | null>(user);
  if (user !== null && user !== shown) setShown(user);
  const target = user ?? shown;
  const deactivating = target?.active ?? true;

  const close = () => {
    updateStaffUser.reset();
    onClose();
  };

  const confirm = () => {
    if (!user) return;
    updateStaffUser.mutate(
      { id: user.id, changes: { active: !user.active } },
      {
        onSuccess: (changed) => {
          updateStaffUser.reset();
          onChanged(changed);
        },
      },
    );
  };

  return (
    <ModalDialog
      open={user !== null}
      onClose={close}
      role="alertdialog"
      title={deactivating ? `Deactivate ${target?.name ?? ''}?` : `Reactivate ${target?.name ?? ''}?`}
      description={
        deactivating
          ? 'They will be signed out and can no longer sign in. Their past actions stay in the audit trail. You can reactivate them later.'
          : 'They can sign in again with their existing password and get back the access their role gives.'
      }
    >
      {target && <p className="text-sm text-ink-muted">{target.email}</p>}
      {updateStaffUser.isError && (
        <Notice className="mt-3">
          {updateStaffUser.error instanceof ApiError
            ? updateStaffUser.error.message
            : 'The change could not be saved. Try again.'}
        </Notice>
      )}
      <DialogActions>
        <Button onClick={close}>Cancel</Button>
        <Button variant={deactivating ? 'danger' : 'primary'} pending={updateStaffUser.isPending} onClick={confirm}>
          {deactivating ? 'Deactivate' : 'Reactivate'}
        </Button>
      </DialogActions>
    </ModalDialog>
  );
}
