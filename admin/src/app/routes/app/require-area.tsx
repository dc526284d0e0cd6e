import { mayUse, type StaffArea } from '@/lib/role-access';
import { EmptyState } from '@/components/ui/states';
import { useStaffSession } from '../../session-context';

/** Shows the page only to roles that may use its area; the api enforces the same rule. */
export function RequireArea({ area, children }: { area: StaffArea; children: React.ReactNode }) {
  const { me } = useStaffSession();
  if (!mayUse(me.role, area)) {
    return (
      <EmptyState title="Not part of your role">
        Your account does not include this page. If you need it for your work, ask a lab admin to change your role.
      </EmptyState>
    );
  }
  return children;
}
