import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import type { Me } from '../api/get-me';
import { signInInputSchema, useSignIn, type SignInInput } from '../api/sign-in';

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

export function SignInForm({ onSignedIn }: SignInFormProps) {
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
    signIn.mutate(input, { onSuccess: (user) => onSignedIn(user) });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {signIn.isError && (
        <Notice tone={signIn.error instanceof ApiError && signIn.error.statusCode === 429 ? 'caution' : 'danger'}>
          {describeFailure(signIn.error)}
        </Notice>
      )}
      <TextField label="E-mail" type="email" autoComplete="username" error={errors.email?.message} {...register('email')} />
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
