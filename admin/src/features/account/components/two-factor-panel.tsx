import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { CopyButton } from '@/components/ui/copy-button';
import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  confirmCodeSchema,
  passwordCheckSchema,
  useBeginTwoFactorSetup,
  useConfirmTwoFactor,
  useRefreshTwoFactor,
  useRenewRecoveryCodes,
  useTurnOffTwoFactor,
  useTwoFactorStatus,
  type ConfirmCodeInput,
  type PasswordCheckInput,
} from '../api/two-factor';

const plainFieldMessages: Record<string, string> = {
  'does not match the authenticator app’s current code':
    'That code does not match. Enter the newest code your app shows.',
  'is not your current password': 'That is not your password.',
};

function plainErrors(error: unknown): unknown {
  if (error instanceof Error && 'fieldErrors' in error && Array.isArray(error.fieldErrors)) {
    for (const fieldError of error.fieldErrors as Array<{ message: string }>)
      fieldError.message = plainFieldMessages[fieldError.message] ?? fieldError.message;
  }
  return error;
}

/** Two-factor sign-in on the person's own account: set-up with a QR code, recovery codes shown once, turning it off. */
export function TwoFactorPanel() {
  const status = useTwoFactorStatus();
  const refresh = useRefreshTwoFactor();
  const [recoveryCodes, setRecoveryCodes] = useState<string[] | null>(null);

  const state = status.data?.enabled ? (
    <Badge tone="success">On</Badge>
  ) : status.data ? (
    <Badge tone="neutral">Off</Badge>
  ) : null;
  return (
    <Panel
      id="two-factor"
      title="Two-factor sign-in"
      description="After your password, Evenhand also asks for a 6-digit code from an authenticator app on your phone, so a leaked password alone cannot open your account."
      actions={state}
    >
      {status.isPending ? (
        <LoadingState label="Reading your sign-in settings…" />
      ) : status.isError ? (
        <ErrorState message={status.error.message} onRetry={() => void status.refetch()} />
      ) : recoveryCodes ? (
        <RecoveryCodes codes={recoveryCodes} onDone={() => void refresh().then(() => setRecoveryCodes(null))} />
      ) : status.data.enabled ? (
        <EnabledSettings
          recoveryCodesLeft={status.data.recoveryCodesLeft}
          required={status.data.required}
          onRenewed={setRecoveryCodes}
        />
      ) : (
        <SetUp required={status.data.required} onEnabled={setRecoveryCodes} />
      )}
    </Panel>
  );
}

function SetUp({ required, onEnabled }: { required: boolean; onEnabled: (codes: string[]) => void }) {
  const begin = useBeginTwoFactorSetup();
  const confirm = useConfirmTwoFactor();
  const keyRef = useRef<HTMLElement>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ConfirmCodeInput>({ resolver: zodResolver(confirmCodeSchema), defaultValues: { code: '' } });

  if (!begin.data) {
    return (
      <div className="flex flex-col items-start gap-3">
        {required && (
          <Notice tone="caution">
            The lab requires admins to sign in with a two-factor code. Set it up to go on using Evenhand.
          </Notice>
        )}
        {begin.isError && <Notice>{begin.error.message}</Notice>}
        <p className="max-w-prose text-sm text-ink-muted">
          You need an authenticator app on your phone (any app that reads QR codes for time-based codes). Setting up
          takes about a minute.
        </p>
        <Button variant="primary" pending={begin.isPending} onClick={() => begin.mutate()}>
          Set up two-factor sign-in
        </Button>
      </div>
    );
  }

  const onSubmit = handleSubmit((input) =>
    confirm.mutate(input, {
      onSuccess: (result) => onEnabled(result.recoveryCodes),
      onError: (error) => applyServerErrors(plainErrors(error), ['code'], setError),
    }),
  );

  return (
    <div className="flex flex-col gap-4">
      <ol className="flex max-w-prose list-decimal flex-col gap-1 pl-5 text-sm">
        <li>In your authenticator app, add an account and scan this QR code.</li>
        <li>Enter the 6-digit code the app then shows, to check it works.</li>
      </ol>
      <div className="flex flex-col gap-4 sm:flex-row sm:items-start">
        <img
          src={begin.data.qrCodeDataUrl}
          alt="QR code for your authenticator app"
          width={176}
          height={176}
          className="size-44 rounded-md border border-line bg-white"
        />
        <div className="flex min-w-0 flex-col gap-1.5 text-sm">
          <p className="text-ink-muted">Cannot scan? Type this key into the app instead:</p>
          <code
            ref={keyRef}
            data-testid="two-factor-key"
            className="rounded-md bg-sunken px-2 py-1 font-mono text-sm break-all"
          >
            {begin.data.secret.replace(/(.{4})/g, '$1 ').trim()}
          </code>
          <div>
            <CopyButton value={begin.data.secret} label="Copy key" fallbackTarget={keyRef} />
          </div>
        </div>
      </div>
      <form
        onSubmit={onSubmit}
        noValidate
        aria-label="Confirm two-factor sign-in"
        className="flex max-w-sm flex-col gap-3"
      >
        {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
        <TextField
          label="Code from your authenticator app"
          inputMode="numeric"
          autoComplete="one-time-code"
          maxLength={7}
          error={errors.code?.message}
          {...register('code')}
        />
        <div>
          <Button type="submit" variant="primary" pending={confirm.isPending}>
            Turn on two-factor sign-in
          </Button>
        </div>
      </form>
    </div>
  );
}

function RecoveryCodes({ codes, onDone }: { codes: string[]; onDone: () => void }) {
  const listRef = useRef<HTMLUListElement>(null);
  return (
    <div className="flex flex-col gap-3">
      <Notice tone="info">
        Two-factor sign-in is on. Save these recovery codes now: they are shown only this once.
      </Notice>
      <p className="max-w-prose text-sm text-ink-muted">
        If you lose your phone, each code signs you in once in place of an app code. Keep them somewhere safe and apart
        from your password, for example printed or in a password manager.
      </p>
      <ul
        ref={listRef}
        aria-label="Recovery codes"
        className="grid max-w-md grid-cols-2 gap-x-6 gap-y-1 rounded-md bg-sunken p-3 font-mono text-sm"
      >
        {codes.map((code) => (
          <li key={code}>{code}</li>
        ))}
      </ul>
      <div className="flex flex-wrap items-center gap-2">
        <CopyButton value={codes.join('\n')} label="Copy codes" fallbackTarget={listRef} />
        <Button variant="primary" onClick={onDone}>
          I have saved them
        </Button>
      </div>
    </div>
  );
}

function EnabledSettings({
  recoveryCodesLeft,
  required,
  onRenewed,
}: {
  recoveryCodesLeft: number;
  required: boolean;
  onRenewed: (codes: string[]) => void;
}) {
  const [action, setAction] = useState<'renew' | 'off' | null>(null);
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm">
        You sign in with your password and a code from your authenticator app.{' '}
        <span className={recoveryCodesLeft <= 2 ? 'font-medium text-caution' : 'text-ink-muted'}>
          {recoveryCodesLeft === 1 ? '1 recovery code is left.' : `${recoveryCodesLeft} recovery codes are left.`}
        </span>
      </p>
      {required && (
        <p className="text-sm text-ink-muted">
          The lab requires two-factor sign-in of admins, so it cannot be turned off for your account.
        </p>
      )}
      {action === null ? (
        <div className="flex flex-wrap gap-2">
          <Button onClick={() => setAction('renew')}>Make new recovery codes</Button>
          {!required && (
            <Button variant="danger" onClick={() => setAction('off')}>
              Turn off two-factor sign-in
            </Button>
          )}
        </div>
      ) : (
        <PasswordCheck action={action} onCancel={() => setAction(null)} onRenewed={onRenewed} />
      )}
    </div>
  );
}

function PasswordCheck({
  action,
  onCancel,
  onRenewed,
}: {
  action: 'renew' | 'off';
  onCancel: () => void;
  onRenewed: (codes: string[]) => void;
}) {
  const renew = useRenewRecoveryCodes();
  const turnOff = useTurnOffTwoFactor();
  const mutation = action === 'renew' ? renew : turnOff;
  const {
    register,
    handleSubmit,
    setError,
    setFocus,
    formState: { errors },
  } = useForm<PasswordCheckInput>({ resolver: zodResolver(passwordCheckSchema), defaultValues: { password: '' } });
  // Opened by a button that asked for it: the password field is the next thing to fill.
  useEffect(() => setFocus('password'), [setFocus]);
  const onError = (error: unknown) => applyServerErrors(plainErrors(error), ['password'], setError);
  const onSubmit = handleSubmit((input) =>
    action === 'renew'
      ? renew.mutate(input, { onSuccess: (result) => onRenewed(result.recoveryCodes), onError })
      : turnOff.mutate(input, { onSuccess: onCancel, onError }),
  );
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={action === 'renew' ? 'Make new recovery codes' : 'Turn off two-factor sign-in'}
      className="flex max-w-sm flex-col gap-3"
    >
      <p className="text-sm text-ink-muted">
        {action === 'renew'
          ? 'New codes replace all your earlier ones.'
          : 'Your account will then open with the password alone.'}{' '}
        Enter your password to go on.
      </p>
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField
        label="Your password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...register('password')}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant={action === 'renew' ? 'primary' : 'danger'} pending={mutation.isPending}>
          {action === 'renew' ? 'Make new codes' : 'Turn off'}
        </Button>
        <Button onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
