import { useQueryClient } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { ConsentWorkspace } from '@/features/consent/components/consent-workspace';
import { rosterKey } from '@/features/roster/api/get-roster';
import type { Role } from '@/lib/role-access';
import { useStudySession } from '../../study-context';

// Who may draft, edit and activate consent versions: the api's EDITORS in consent.controller.ts.
const consentEditors: readonly Role[] = ['coordinator', 'researcher', 'admin'];

export function Component() {
  const { studyId = '' } = useParams();
  const { me, study } = useStudySession();
  const queryClient = useQueryClient();

  return (
    <>
      <title>{`Consent · ${study.title} · Evenhand`}</title>
      <ConsentWorkspace
        studyId={studyId}
        canEdit={consentEditors.includes(me.role)}
        // Activation flags everyone enrolled for re-consent, so the roster's flags change too.
        onActivated={() => void queryClient.invalidateQueries({ queryKey: rosterKey(studyId) })}
      />
    </>
  );
}
