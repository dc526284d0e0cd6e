import { StaffDirectory } from '@/features/staff/components/staff-directory';
import { useStaffSession } from '../../session-context';
import { RequireArea } from './require-area';

export function Component() {
  const { me } = useStaffSession();
  return (
    <RequireArea area="staff">
      <title>Staff · Evenhand</title>
      <StaffDirectory currentUserId={me.id} />
    </RequireArea>
  );
}
