import { Panel } from '@/components/ui/panel';
import { Notice } from '@/components/ui/states';
import { ChangePasswordForm } from '@/features/account/components/change-password-form';
import { TwoFactorPanel } from '@/features/account/components/two-factor-panel';
import { roleLabels } from '@/lib/role-access';
import { useStaffSession } from '../../session-context';

export function Component() {
  const { me } = useStaffSession();
  return (
    <div className="flex flex-col gap-5">
      <title>Your account · Evenhand</title>
      <div>
        <h1 className="text-xl font-semibold">Your account</h1>
        <p className="text-sm break-all text-ink-muted">
          {me.name} · {me.email} · {roleLabels[me.role]}
        </p>
      </div>
      {me.twoFactorSetupNeeded && (
        <Notice tone="caution">
          The lab requires admins to sign in with a two-factor code. Set it up below; the rest of Evenhand opens once it
          is on.
        </Notice>
      )}
      <TwoFactorPanel />
      <Panel
        id="password"
        title="Password"
        description="Change the password you sign in with. If you have forgotten it, sign out and use “Forgot your password?” on the sign-in page."
      >
        <ChangePasswordForm />
      </Panel>
    </div>
  );
}
