import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useActivateConsentVersion } from '../api/activate-consent-version';
import type { ConsentVersion } from '../api/get-consent-versions';
import { formatLetterDate } from '../utils/consent-dates';

const fieldNames: Record<string, string> = {
  approvalReference: 'Approval reference',
  approvedAt: 'Approval date',
  letter: 'Approval letter',
  body: 'Form text',
};

function fieldName(field: string): string {
  return fieldNames[field] ?? fieldNames[field.split('.')[0] ?? ''] ?? field;
}

export interface ActivationDialogProps {
  studyId: string;
  version: ConsentVersion;
  /** The version participants sign now, which activation retires; null when none is active. */
  activeVersionNumber: number | null;
  open: boolean;
  onClose: () => void;
  onActivated: (version: ConsentVersion) => void;
}

export function ActivationDialog({
  studyId,
  version,
  activeVersionNumber,
  open,
  onClose,
  onActivated,
}: ActivationDialogProps) {
  const activate = useActivateConsentVersion(studyId, version.id);
  const [refusal, setRefusal] = useState<unknown>(null);

  const close = () => {
    setRefusal(null);
    activate.reset();
    onClose();
  };

  const confirm = () => {
    setRefusal(null);
    activate.mutate(undefined, {
      onSuccess: (activated) => {
        activate.reset();
        onActivated(activated);
      },
      onError: setRefusal,
    });
  };

  return (
    <ModalDialog
      open={open}
      onClose={close}
      role="alertdialog"
      title={`Activate version ${version.version}?`}
      description="Activation cannot be undone. Check the text and the approval details first."
    >
      <ul className="flex list-disc flex-col gap-2 pl-5 text-sm text-ink">
        <li>
          <strong className="font-semibold">The text is fixed.</strong> Its SHA-256 fingerprint is computed now and
          stays with every signature made on it. To change the wording later, start a new draft.
        </li>
        <li>
          {activeVersionNumber !== null ? (
            <>
              <strong className="font-semibold">Version {activeVersionNumber} is retired.</strong> It stays on record
              with its signatures; nothing is deleted.
            </>
          ) : (
            <>
              <strong className="font-semibold">Consent opens.</strong> Participants can sign from now on.
            </>
          )}
        </li>
        {activeVersionNumber !== null && (
          <li>
            <strong className="font-semibold">Everyone enrolled is asked to sign again.</strong> Each participant taking
            part has to sign version {version.version} before their next step. You can send a reminder from the roster.
          </li>
        )}
      </ul>
      <dl className="mt-4 grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 rounded-md bg-canvas px-3 py-2 text-sm">
        <dt className="text-ink-muted">Approval reference</dt>
        <dd className="font-mono text-xs leading-5">{version.approvalReference ?? 'not entered'}</dd>
        <dt className="text-ink-muted">Approval date</dt>
        <dd>{version.approvedAt ? formatLetterDate(version.approvedAt) : 'not entered'}</dd>
        <dt className="text-ink-muted">Approval letter</dt>
        <dd>{version.approvalLetter ? (version.approvalLetter.name ?? 'uploaded') : 'not uploaded'}</dd>
      </dl>
      {refusal !== null && <ActivationRefusal error={refusal} />}
      <DialogActions>
        <Button onClick={close}>Cancel</Button>
        <Button variant="primary" pending={activate.isPending} onClick={confirm}>
          Activate version {version.version}
        </Button>
      </DialogActions>
    </ModalDialog>
  );
}

function ActivationRefusal({ error }: { error: unknown }) {
  if (!(error instanceof ApiError)) {
    return <Notice className="mt-4">The version could not be activated. Check your connection and try again.</Notice>;
  }
  return (
    <Notice className="mt-4">
      <p className="font-medium">{error.message}</p>
      {error.fieldErrors.length > 0 && (
        <ul className="mt-1 list-disc pl-5">
          {error.fieldErrors.map((problem, index) => (
            <li key={`${problem.field}-${index}`}>
              {fieldName(problem.field)}: {problem.message}
            </li>
          ))}
        </ul>
      )}
    </Notice>
  );
}
