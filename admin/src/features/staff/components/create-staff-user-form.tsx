import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  createStaffUserInputSchema,
  minimumPasswordLength,
  useCreateStaffUser,
  type CreateStaffUserInput,
} from '../api/create-staff-user';
import type { StaffUser } from '../api/get-staff-users';
import { staffRoleOptions } from '../api/staff-roles';

const formFields = ['email', 'name', 'role', 'password'] as const;

export interface CreateStaffUserFormProps {
  onCreated: (user: StaffUser) => void;
  onCancel: () => void;
}

export function CreateStaffUserForm({ onCreated, onCancel }: CreateStaffUserFormProps) {
  const createStaffUser = useCreateStaffUser();
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<CreateStaffUserInput>({
    resolver: zodResolver(createStaffUserInputSchema),
    defaultValues: { email: '', name: '', password: '' },
  });

  const onSubmit = handleSubmit((input) => {
    createStaffUser.mutate(input, {
      onSuccess: (user) => onCreated(user),
      onError: (error) => applyServerErrors(error, formFields, setError),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label="New staff member">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
      <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...register('email')} />
      <Controller
        control={control}
        name="role"
        render={({ field, fieldState }) => (
          <SelectField
            label="Role"
            value={field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={staffRoleOptions}
            placeholder="Choose a role"
            error={fieldState.error?.message}
          />
        )}
      />
      <TextField
        label="Temporary password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${minimumPasswordLength} characters. Share it with them in person; they sign in with it.`}
        error={errors.password?.message}
        {...register('password')}
      />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={createStaffUser.isPending}>
          Add staff member
        </Button>
      </DialogActions>
    </form>
  );
}
