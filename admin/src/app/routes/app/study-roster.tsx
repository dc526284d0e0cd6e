import { useParams } from 'react-router-dom';
import { Roster } from '@/features/roster/components/roster';
import { useSteps } from '@/features/study-design/api/get-steps';
import { useStratificationFactors } from '@/features/study-design/api/get-stratification-factors';
import type { Role } from '@/lib/role-access';
import { useStudySession } from '../../study-context';

// Who may import, invite, remind, mark steps and record changes: the api's @Roles on the roster routes
// (enrollments.controller.ts); every participant's codes are for all members but auditors.
const rosterManagers: readonly Role[] = ['coordinator', 'admin'];
const codeReaders: readonly Role[] = ['coordinator', 'researcher', 'admin'];

export function Component() {
  const { studyId = '' } = useParams();
  const { me, study } = useStudySession();
  const factors = useStratificationFactors(studyId);
  const steps = useSteps(studyId);

  return (
    <>
      <title>{`Roster · ${study.title} · Evenhand`}</title>
      <Roster
        studyId={studyId}
        blinded={study.blinded}
        canManage={rosterManagers.includes(me.role)}
        canDownloadCodes={codeReaders.includes(me.role)}
        recordHref={(enrollmentId) => `/studies/${studyId}/roster/${enrollmentId}`}
        factorKeys={factors.data?.items.map((factor) => factor.key)}
        steps={steps.data?.items.map((step) => ({ id: step.id, position: step.position, title: step.title }))}
      />
    </>
  );
}
