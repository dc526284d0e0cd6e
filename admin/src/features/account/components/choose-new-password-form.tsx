import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import {
  chooseNewPasswordSchema,
  MIN_PASSWORD_LENGTH,
  useConsumePasswordReset,
  type ChooseNewPasswordInput,
} from '../api/passwords';

export function ChooseNewPasswordForm({ token }: { token: string }) {
  const consume = useConsumePasswordReset();
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<ChooseNewPasswordInput>({
    resolver: zodResolver(chooseNewPasswordSchema),
    defaultValues: { newPassword: '', repeatPassword: '' },
  });

  if (consume.isSuccess) {
    return (
      <Notice tone="info">
        Your new password is set, and you were signed out everywhere else.{' '}
        <Link to="/sign-in" className="font-medium underline underline-offset-2">
          Sign in
        </Link>{' '}
        with it now.
      </Notice>
    );
  }
  const linkProblem = consume.error instanceof ApiError && consume.error.code === 'LINK_INVALID';
  return (
    <form
      onSubmit={handleSubmit(({ newPassword }) => consume.mutate({ token, newPassword }))}
      noValidate
      aria-label="Choose a new password"
      className="flex flex-col gap-4"
    >
      {consume.isError && (
        <Notice>
          {linkProblem ? (
            <>
              This link cannot be used any more: it was used already, has expired, or is incomplete.{' '}
              <Link to="/forgot-password" className="font-medium underline underline-offset-2">
                Ask for a new one
              </Link>
              .
            </>
          ) : consume.error instanceof ApiError ? (
            consume.error.message
          ) : (
            'Something went wrong. Check your connection and try again.'
          )}
        </Notice>
      )}
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${MIN_PASSWORD_LENGTH} characters.`}
        error={errors.newPassword?.message}
        {...register('newPassword')}
      />
      <TextField
        label="New password again"
        type="password"
        autoComplete="new-password"
        error={errors.repeatPassword?.message}
        {...register('repeatPassword')}
      />
      <Button type="submit" variant="primary" pending={consume.isPending}>
        Set new password
      </Button>
    </form>
  );
}
