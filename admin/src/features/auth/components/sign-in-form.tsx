import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import type { Me } from '../api/get-me';
import {
  secondFactorSchema,
  signInInputSchema,
  useSignIn,
  type SecondFactorInput,
  type SignInInput,
} from '../api/sign-in';

export interface SignInFormProps {
  onSignedIn: (user: Me) => void;
}

function describeFailure(error: unknown): string {
  if (error instanceof ApiError) {
    // The api keeps the 401 message generic on purpose (it never says whether the e-mail exists); show it as is.
    return error.message;
  }
  return 'Something went wrong. Check your connection and try again.';
}

/** Password first; when the account has two-factor sign-in on, the api asks for a code and the form shows step two. */
export function SignInForm({ onSignedIn }: SignInFormProps) {
  const [credentials, setCredentials] = useState<SignInInput | null>(null);
  if (credentials)
    return (
      <SecondFactorForm credentials={credentials} onSignedIn={onSignedIn} onStartOver={() => setCredentials(null)} />
    );
  return <PasswordForm onSignedIn={onSignedIn} onCodeAsked={setCredentials} />;
}

function PasswordForm({
  onSignedIn,
  onCodeAsked,
}: SignInFormProps & { onCodeAsked: (credentials: SignInInput) => void }) {
  const signIn = useSignIn();
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<SignInInput>({
    resolver: zodResolver(signInInputSchema),
    defaultValues: { email: '', password: '' },
  });

  const onSubmit = handleSubmit((input) => {
    signIn.mutate(input, {
      onSuccess: (user) => onSignedIn(user),
      onError: (error) => {
        if (error instanceof ApiError && error.code === 'TWO_FACTOR_REQUIRED') onCodeAsked(input);
      },
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {signIn.isError && !(signIn.error instanceof ApiError && signIn.error.code === 'TWO_FACTOR_REQUIRED') && (
        <Notice tone={signIn.error instanceof ApiError && signIn.error.statusCode === 429 ? 'caution' : 'danger'}>
          {describeFailure(signIn.error)}
        </Notice>
      )}
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        error={errors.email?.message}
        {...register('email')}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...register('password')}
      />
      <Button type="submit" variant="primary" pending={signIn.isPending} className="mt-1 w-full">
        {signIn.isPending ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}

function SecondFactorForm({
  credentials,
  onSignedIn,
  onStartOver,
}: SignInFormProps & { credentials: SignInInput; onStartOver: () => void }) {
  const signIn = useSignIn();
  const {
    register,
    handleSubmit,
    watch,
    setValue,
    setFocus,
    formState: { errors },
  } = useForm<SecondFactorInput>({
    resolver: zodResolver(secondFactorSchema),
    defaultValues: { kind: 'code', value: '' },
  });
  const kind = watch('kind');
  // The second step (and each switch of kind) puts the caret in the one field it asks for.
  useEffect(() => setFocus('value'), [kind, setFocus]);

  const onSubmit = handleSubmit(({ kind: chosen, value }) => {
    const factor = chosen === 'code' ? { code: value.replace(/\s+/g, '') } : { recoveryCode: value };
    signIn.mutate({ ...credentials, ...factor }, { onSuccess: (user) => onSignedIn(user) });
  });

  const switchKind = () => {
    setValue('kind', kind === 'code' ? 'recovery-code' : 'code');
    setValue('value', '');
    signIn.reset();
    setFocus('value');
  };

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Two-factor code">
      <p className="text-sm text-ink-muted">
        {kind === 'code' ? (
          <>
            Your account asks for a second step. Open your authenticator app and enter the 6-digit code it shows for
            Evenhand (<span className="break-all">{credentials.email}</span>).
          </>
        ) : (
          'Enter one of the recovery codes you saved when you turned on two-factor sign-in. Each code works once.'
        )}
      </p>
      {signIn.isError && (
        <Notice tone={signIn.error instanceof ApiError && signIn.error.statusCode === 429 ? 'caution' : 'danger'}>
          {describeFailure(signIn.error)}
        </Notice>
      )}
      {kind === 'code' ? (
        <TextField
          key="code"
          label="Code from your authenticator app"
          inputMode="numeric"
          autoComplete="one-time-code"
          maxLength={7}
          error={errors.value?.message}
          {...register('value')}
        />
      ) : (
        <TextField
          key="recovery"
          label="Recovery code"
          autoComplete="off"
          spellCheck={false}
          error={errors.value?.message}
          {...register('value')}
        />
      )}
      <Button type="submit" variant="primary" pending={signIn.isPending} className="mt-1 w-full">
        {signIn.isPending ? 'Checking…' : 'Sign in'}
      </Button>
      <div className="flex flex-wrap justify-between gap-2 text-sm">
        <button
          type="button"
          onClick={switchKind}
          className="font-medium text-spruce-ink underline underline-offset-2 hover:text-spruce"
        >
          {kind === 'code' ? 'Use a recovery code instead' : 'Use a code from the app instead'}
        </button>
        <button
          type="button"
          onClick={onStartOver}
          className="text-ink-muted underline underline-offset-2 hover:text-ink"
        >
          Start over
        </button>
      </div>
    </form>
  );
}
