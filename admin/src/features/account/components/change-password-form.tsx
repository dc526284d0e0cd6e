import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  changePasswordSchema,
  MIN_PASSWORD_LENGTH,
  useChangePassword,
  type ChangePasswordInput,
} from '../api/passwords';

const formFields = ['currentPassword', 'newPassword'] as const;
// The api names the field; the form says it in words.
const plainFieldMessages: Record<string, string> = {
  'is not your current password': 'That is not your current password.',
  'must differ from the current password': 'Choose a password different from the current one.',
};

export function ChangePasswordForm() {
  const changePassword = useChangePassword();
  const [changed, setChanged] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm<ChangePasswordInput>({
    resolver: zodResolver(changePasswordSchema),
    defaultValues: { currentPassword: '', newPassword: '', repeatPassword: '' },
  });

  const onSubmit = handleSubmit((input) => {
    setChanged(false);
    changePassword.mutate(input, {
      onSuccess: () => {
        reset();
        setChanged(true);
      },
      onError: (error) => {
        if (error instanceof Error && 'fieldErrors' in error && Array.isArray(error.fieldErrors)) {
          for (const fieldError of error.fieldErrors as Array<{ message: string }>)
            fieldError.message = plainFieldMessages[fieldError.message] ?? fieldError.message;
        }
        applyServerErrors(error, formFields, setError);
      },
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Change your password" className="flex max-w-sm flex-col gap-3.5">
      <div aria-live="polite" className="empty:hidden">
        {changed && <Notice tone="info">Your password was changed. Use the new one next time you sign in.</Notice>}
      </div>
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField
        label="Current password"
        type="password"
        autoComplete="current-password"
        error={errors.currentPassword?.message}
        {...register('currentPassword')}
      />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words make a strong one.`}
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
      <div>
        <Button type="submit" variant="primary" pending={changePassword.isPending}>
          Change password
        </Button>
      </div>
    </form>
  );
}
