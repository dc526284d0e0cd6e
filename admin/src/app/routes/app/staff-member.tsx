import { useParams } from 'react-router-dom';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { StaffStudiesPanel } from '@/features/membership/components/staff-studies-panel';
import { useStaffUser } from '@/features/staff/api/get-staff-user';
import { StaffMemberSummary } from '@/features/staff/components/staff-member-summary';
import { ApiError } from '@/lib/api-error';
import { isStaffRole } from '@/lib/role-access';
import { RequireArea } from './require-area';

export function Component() {
  const { userId = '' } = useParams();
  const user = useStaffUser(userId);
  return (
    <RequireArea area="staff">
      <title>{`${user.data?.name ?? 'Staff member'} · Staff · Evenhand`}</title>
      {user.isPending ? (
        <LoadingState label="Loading the staff member…" />
      ) : user.isError ? (
        <ErrorState
          title={user.error instanceof ApiError && user.error.statusCode === 404 ? 'No such staff member' : undefined}
          message={user.error instanceof ApiError ? user.error.message : 'This staff member could not be loaded.'}
          onRetry={() => void user.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-5">
          <StaffMemberSummary user={user.data} />
          {isStaffRole(user.data.role) && <StaffStudiesPanel person={{ ...user.data, role: user.data.role }} />}
        </div>
      )}
    </RequireArea>
  );
}
