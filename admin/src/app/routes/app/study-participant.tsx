import { useParams } from 'react-router-dom';
import { ParticipantRecord } from '@/features/roster/components/participant-record';
import type { Role } from '@/lib/role-access';
import { useStudySession } from '../../study-context';

// The api's @Roles: marking steps, undoing, messages and participation changes are for coordinators and admins;
// participants' codes are shown to every member but auditors (enrollments.controller.ts, reminders.controller.ts).
const recordManagers: readonly Role[] = ['coordinator', 'admin'];
const codeReaders: readonly Role[] = ['coordinator', 'researcher', 'admin'];

export function Component() {
  const { studyId = '', enrollmentId = '' } = useParams();
  const { study, me } = useStudySession();

  return (
    <>
      <title>{`Participant record · ${study.title} · Evenhand`}</title>
      <ParticipantRecord
        studyId={studyId}
        enrollmentId={enrollmentId}
        blinded={study.blinded}
        currency={study.currency}
        canManage={recordManagers.includes(me.role)}
        canSeeCodes={codeReaders.includes(me.role)}
        backHref={`/studies/${studyId}/roster`}
      />
    </>
  );
}
