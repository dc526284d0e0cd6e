import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import { requestResetSchema, useRequestPasswordReset, type RequestResetInput } from '../api/passwords';

export function RequestResetForm() {
  const requestReset = useRequestPasswordReset();
  const {
    register,
    handleSubmit,
    getValues,
    formState: { errors },
  } = useForm<RequestResetInput>({ resolver: zodResolver(requestResetSchema), defaultValues: { email: '' } });

  if (requestReset.isSuccess) {
    return (
      <Notice tone="info">
        If {getValues('email')} belongs to a staff account, a link to choose a new password is on its way. It works
        once, for an hour. Nothing arrived? Check the spam folder, or ask a lab admin.
      </Notice>
    );
  }
  return (
    <form
      onSubmit={handleSubmit((input) => requestReset.mutate(input))}
      noValidate
      aria-label="Ask for a password link"
      className="flex flex-col gap-4"
    >
      {requestReset.isError && (
        <Notice>
          {requestReset.error instanceof ApiError
            ? requestReset.error.message
            : 'Something went wrong. Check your connection and try again.'}
        </Notice>
      )}
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        error={errors.email?.message}
        {...register('email')}
      />
      <Button type="submit" variant="primary" pending={requestReset.isPending}>
        Send me a link
      </Button>
    </form>
  );
}
