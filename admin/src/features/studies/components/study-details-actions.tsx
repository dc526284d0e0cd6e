import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useSetStudyArchived } from '../api/archive-study';
import type { Study } from '../api/get-study';
import { EditStudyDetailsForm } from './edit-study-details-form';

/** "Edit details" while the study may change; "Archive" (confirmed) once it is closed, and back again. */
export function StudyDetailsActions({ study }: { study: Study }) {
  const [editing, setEditing] = useState(false);
  const [confirming, setConfirming] = useState(false);
  const [saved, setSaved] = useState(false);
  const setArchived = useSetStudyArchived(study.id);
  const archived = study.archivedAt !== null;

  const closeConfirm = () => {
    setArchived.reset();
    setConfirming(false);
  };

  return (
    <>
      {study.status !== 'closed' && !archived && (
        <Button
          onClick={() => {
            setSaved(false);
            setEditing(true);
          }}
        >
          Edit details
        </Button>
      )}
      {study.status === 'closed' && (
        <Button onClick={() => setConfirming(true)}>{archived ? 'Take out of the archive' : 'Archive'}</Button>
      )}
      <span aria-live="polite" className="sr-only">
        {saved ? 'The study details were saved.' : ''}
      </span>
      <ModalDialog open={editing} onClose={() => setEditing(false)} title="Edit study details" size="wide">
        {editing && (
          <EditStudyDetailsForm
            study={study}
            onCancel={() => setEditing(false)}
            onSaved={() => {
              setEditing(false);
              setSaved(true);
            }}
          />
        )}
      </ModalDialog>
      <ModalDialog
        open={confirming}
        onClose={closeConfirm}
        role="alertdialog"
        title={archived ? `Take ${study.title} out of the archive?` : `Archive ${study.title}?`}
        description={
          archived
            ? 'It goes back to the list of studies. It stays closed.'
            : 'It leaves the list of studies and moves to the archive, where anyone with access can still open every record. Nothing is deleted, and you can take it out again.'
        }
      >
        {setArchived.isError && (
          <Notice>
            {setArchived.error instanceof ApiError
              ? setArchived.error.message
              : 'The change could not be saved. Try again.'}
          </Notice>
        )}
        <DialogActions>
          <Button onClick={closeConfirm}>Cancel</Button>
          <Button
            variant="primary"
            pending={setArchived.isPending}
            onClick={() => setArchived.mutate(!archived, { onSuccess: () => setConfirming(false) })}
          >
            {archived ? 'Take out of the archive' : 'Archive study'}
          </Button>
        </DialogActions>
      </ModalDialog>
    </>
  );
}
