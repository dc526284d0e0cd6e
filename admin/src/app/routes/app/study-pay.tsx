import { useParams } from 'react-router-dom';
import { useConditions } from '@/features/study-design/api/get-conditions';
import { PayWorkspace } from '@/features/payouts/components/pay-workspace';
import type { Role } from '@/lib/role-access';
import { useStudySession } from '../../study-context';

// The api's @Roles on the pay routes (payouts.controller.ts): who may fund, approve and retry, and who may
// run the provider check and read the tax threshold.
const payManagers: readonly Role[] = ['coordinator', 'admin'];
const payReviewers: readonly Role[] = ['coordinator', 'auditor', 'admin'];

export function Component() {
  const { studyId = '' } = useParams();
  const { me, study } = useStudySession();
  const conditions = useConditions(studyId);

  return (
    <>
      <title>{`Pay · ${study.title} · Evenhand`}</title>
      <PayWorkspace
        studyId={studyId}
        currency={study.currency}
        blinded={study.blinded}
        canManage={payManagers.includes(me.role)}
        canReview={payReviewers.includes(me.role)}
        conditions={(conditions.data ?? []).map((condition) => ({
          id: condition.id,
          label: condition.internalName ?? condition.code,
        }))}
      />
    </>
  );
}
