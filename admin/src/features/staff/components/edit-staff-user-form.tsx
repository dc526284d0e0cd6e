import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import { isStaffRole } from '@/lib/role-access';
import type { StaffUser } from '../api/get-staff-users';
import { staffRoleOptions } from '../api/staff-roles';
import { updateStaffUserInputSchema, useUpdateStaffUser, type UpdateStaffUserInput } from '../api/update-staff-user';

const formFields = ['name', 'role'] as const;

export interface EditStaffUserFormProps {
  user: StaffUser;
  onSaved: (user: StaffUser) => void;
  onCancel: () => void;
}

export function EditStaffUserForm({ user, onSaved, onCancel }: EditStaffUserFormProps) {
  const updateStaffUser = useUpdateStaffUser();
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors, isDirty },
  } = useForm<UpdateStaffUserInput>({
    resolver: zodResolver(updateStaffUserInputSchema),
    defaultValues: { name: user.name, role: isStaffRole(user.role) ? user.role : undefined },
  });

  const onSubmit = handleSubmit((changes) => {
    updateStaffUser.mutate(
      { id: user.id, changes },
      {
        onSuccess: (user) => onSaved(user),
        onError: (error) => applyServerErrors(error, formFields, setError),
      },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label={`Edit ${user.name}`}>
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField label="E-mail" value={user.email} disabled readOnly hint="The sign-in address cannot be changed." />
      <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
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
            error={fieldState.error?.message}
          />
        )}
      />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={!isDirty} pending={updateStaffUser.isPending}>
          Save changes
        </Button>
      </DialogActions>
    </form>
  );
}
