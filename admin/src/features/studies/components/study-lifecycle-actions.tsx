import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useQueryClient } from '@tanstack/react-query';
import { studyKeys } from '@/lib/study-keys';
import { useChangeStudyStatus, type StudyTransition } from '../api/change-study-status';
import { missingOpeningItems } from '../utils/opening-requirements';
import type { Study } from '../api/get-study';
import { StudyDetailsActions } from './study-details-actions';

const dialogs: Record<StudyTransition, { title: string; confirm: string; body: (study: Study) => React.ReactNode }> = {
  open: {
    title: 'Open the study?',
    confirm: 'Open study',
    body: (study) =>
      study.status === 'paused' ? (
        <p>
          Participants can join and sign again. The sealed assignment sequence and its fingerprint stay as they are.
        </p>
      ) : (
        <>
          <p>
            Opening draws a secret seed, seals the assignment sequence with it and publishes the sequence’s fingerprint
            (a SHA-256 commitment) on the Assignment page and in the audit trail. The seed stays secret until the study
            closes or is unblinded, so nobody can foresee or change who gets which condition.
          </p>
          <p className="mt-2">
            Conditions, stratification factors and the scheme can still change until the first person is assigned; each
            change seals a fresh sequence under a new fingerprint.
          </p>
        </>
      ),
  },
  pause: {
    title: 'Pause recruiting?',
    confirm: 'Pause',
    body: () => (
      <p>
        New people cannot join or sign while the study is paused. Everyone already taking part keeps their condition and
        steps.
      </p>
    ),
  },
  close: {
    title: 'Close the study?',
    confirm: 'Close study',
    body: () => (
      <>
        <p>
          Closing seals the study for good: conditions, steps and the scheme can no longer change, and nobody new can
          join.
        </p>
        <p className="mt-2">
          The secret seed is revealed, so anyone with access can re-derive the whole assignment sequence and check it
          against the published fingerprint. This cannot be undone.
        </p>
      </>
    ),
  },
};

export interface StudyLifecycleActionsProps {
  study: Study;
}

/** Open, pause and close, each confirmed in a dialog that says what it does; the api’s refusal shows in the dialog. */
export function StudyLifecycleActions({ study }: StudyLifecycleActionsProps) {
  const changeStatus = useChangeStudyStatus(study.id);
  const queryClient = useQueryClient();
  const [pending, setPending] = useState<StudyTransition | null>(null);
  const [shown, setShown] = useState<StudyTransition>('open');
  if (pending !== null && pending !== shown) setShown(pending);

  const ask = (transition: StudyTransition) => {
    changeStatus.reset();
    setPending(transition);
  };
  const close = () => {
    changeStatus.reset();
    setPending(null);
  };
  const confirm = () => {
    if (!pending) return;
    changeStatus.mutate(pending, {
      onSuccess: () => setPending(null),
      // A refusal names what is missing; the checklist on Set-up shows the same, fresh.
      onError: () => void queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(study.id) }),
    });
  };

  const dialog = dialogs[shown];
  return (
    <div className="flex flex-wrap gap-2">
      <StudyDetailsActions study={study} />
      {(study.status === 'draft' || study.status === 'paused') && (
        <Button variant="primary" onClick={() => ask('open')}>
          {study.status === 'paused' ? 'Resume recruiting' : 'Open study'}
        </Button>
      )}
      {study.status === 'recruiting' && <Button onClick={() => ask('pause')}>Pause</Button>}
      {(study.status === 'recruiting' || study.status === 'paused') && (
        <Button variant="danger" onClick={() => ask('close')}>
          Close study
        </Button>
      )}
      <ModalDialog open={pending !== null} onClose={close} role="alertdialog" title={dialog.title}>
        <div className="text-sm text-ink">{dialog.body(study)}</div>
        {changeStatus.isError && <RefusalNotice error={changeStatus.error} transition={shown} />}
        <DialogActions>
          <Button onClick={close}>Cancel</Button>
          <Button variant={shown === 'close' ? 'danger' : 'primary'} pending={changeStatus.isPending} onClick={confirm}>
            {dialog.confirm}
          </Button>
        </DialogActions>
      </ModalDialog>
    </div>
  );
}

function RefusalNotice({ error, transition }: { error: unknown; transition: StudyTransition }) {
  if (!(error instanceof ApiError)) return <Notice className="mt-3">The change could not be saved. Try again.</Notice>;
  // Both refusals name the opening checklist's items by key in errors[].
  const checklistRefusal = error.code === 'STUDY_NOT_READY_TO_OPEN' || error.code === 'SCHEME_MISSING';
  if (transition === 'open' && checklistRefusal && error.fieldErrors.length > 0) {
    const missing = missingOpeningItems(error.fieldErrors);
    return (
      <Notice className="mt-3">
        <p className="font-medium">The study cannot open yet. Still needed:</p>
        <ul className="mt-1 list-disc pl-5" aria-label="Still needed before opening">
          {missing.map((item) => (
            <li key={item.key}>
              <span className="font-semibold">{item.label}:</span> {item.detail}
            </li>
          ))}
        </ul>
      </Notice>
    );
  }
  return <Notice className="mt-3">{error.message}</Notice>;
}
