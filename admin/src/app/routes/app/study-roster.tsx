import { useParams } from 'react-router-dom';
import { Roster } from '@/features/roster/components/roster';
import { useStratificationFactors } from '@/features/study-design/api/get-stratification-factors';
import type { Role } from '@/lib/role-access';
import { useStudySession } from '../../study-context';

// Who may import, invite, remind and record changes: the api's @Roles on the roster routes (enrollments.controller.ts).
const rosterManagers: readonly Role[] = ['coordinator', 'admin'];

export function Component() {
  const { studyId = '' } = useParams();
  const { me, study } = useStudySession();
  const factors = useStratificationFactors(studyId);

  return (
    <>
      <title>{`Roster · ${study.title} · Evenhand`}</title>
      <Roster
        studyId={studyId}
        blinded={study.blinded}
        canManage={rosterManagers.includes(me.role)}
        recordHref={(enrollmentId) => `/studies/${studyId}/roster/${enrollmentId}`}
        factorKeys={factors.data?.items.map((factor) => factor.key)}
      />
    </>
  );
}
