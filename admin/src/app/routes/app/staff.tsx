import { LabSettingsPanel } from '@/features/lab-settings/components/lab-settings-panel';
import { StaffDirectory } from '@/features/staff/components/staff-directory';
import { useStaffSession } from '../../session-context';
import { RequireArea } from './require-area';

export function Component() {
  const { me } = useStaffSession();
  return (
    <RequireArea area="staff">
      <title>Staff · Evenhand</title>
      <div className="flex flex-col gap-6">
        <StaffDirectory currentUserId={me.id} />
        <LabSettingsPanel />
      </div>
    </RequireArea>
  );
}
