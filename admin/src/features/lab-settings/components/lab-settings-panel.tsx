import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { SwitchField } from '@/components/ui/switch-field';
import { useLabSettings, useUpdateLabSettings } from '../api/lab-settings';

/** The lab's own settings, switched by admins; each change is in the audit trail. */
export function LabSettingsPanel() {
  const settings = useLabSettings();
  const update = useUpdateLabSettings();
  return (
    <Panel
      id="lab-settings"
      title="Lab settings"
      description="Rules for everyone who works in this lab’s Evenhand. Each change is recorded in the audit trail."
    >
      {settings.isPending ? (
        <LoadingState label="Reading the lab settings…" />
      ) : settings.isError ? (
        <ErrorState message={settings.error.message} onRetry={() => void settings.refetch()} />
      ) : (
        <div className="flex flex-col gap-3">
          {update.isError && <Notice>{update.error.message}</Notice>}
          <SwitchField
            label="Require two-factor sign-in for admins"
            hint="Admins then sign in with a code from an authenticator app as well as their password. An admin who has not set it up can only reach Your account until they do."
            checked={settings.data.twoFactorRequiredForAdmins}
            disabled={update.isPending}
            onChange={(checked) => update.mutate({ twoFactorRequiredForAdmins: checked })}
          />
        </div>
      )}
    </Panel>
  );
}
