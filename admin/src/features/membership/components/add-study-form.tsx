import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { SelectField, type SelectOption } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import type { StaffRole } from '@/lib/role-access';
import { useAddMembership } from '../api/change-membership';
import { useStudyChoices } from '../api/get-study-choices';
import { addStudyInputSchema, type AddStudyInput } from '../api/membership-form-schema';
import { fittingMembershipRoles, type StaffStudy } from '../api/membership-keys';
import { membershipErrorMessage, membershipRoleLabels } from './membership-labels';

export interface AddStudyFormProps {
  person: { email: string; name: string; role: StaffRole };
  memberOf: readonly StaffStudy[];
  onAdded: (studyTitle: string) => void;
  onCancel: () => void;
}

/** Gives one staff member a study; the role list holds only what their staff role allows. */
export function AddStudyForm({ person, memberOf, onAdded, onCancel }: AddStudyFormProps) {
  const studies = useStudyChoices();
  const addMembership = useAddMembership();
  const fitting = fittingMembershipRoles(person.role);
  const { control, handleSubmit } = useForm<AddStudyInput>({
    resolver: zodResolver(addStudyInputSchema),
    defaultValues: fitting.length === 1 ? { role: fitting[0] } : {},
  });

  const taken = new Set(memberOf.map((membership) => membership.studyId));
  const studyOptions: SelectOption<string>[] = (studies.data?.items ?? [])
    .filter((study) => !taken.has(study.id))
    .map((study) => ({ value: study.id, label: study.title, description: study.slug }));

  const onSubmit = handleSubmit(({ studyId, role }) => {
    const title = studies.data?.items.find((study) => study.id === studyId)?.title ?? 'the study';
    addMembership.mutate({ studyId, email: person.email, role }, { onSuccess: () => onAdded(title) });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label={`Give ${person.name} a study`}>
      {addMembership.isError && (
        <Notice>{membershipErrorMessage(addMembership.error, 'The study could not be added. Try again.')}</Notice>
      )}
      {studies.isError && <Notice>{membershipErrorMessage(studies.error, 'The studies could not be loaded.')}</Notice>}
      <Controller
        control={control}
        name="studyId"
        render={({ field, fieldState }) => (
          <SelectField
            label="Study"
            value={field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={studyOptions}
            placeholder={
              studies.isPending
                ? 'Loading studies…'
                : studyOptions.length === 0
                  ? 'They are in every study already'
                  : 'Choose a study…'
            }
            disabled={studyOptions.length === 0}
            error={fieldState.error?.message}
          />
        )}
      />
      <Controller
        control={control}
        name="role"
        render={({ field, fieldState }) => (
          <SelectField
            label="Role in the study"
            value={field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={fitting.map((role) => membershipRoleLabels[role])}
            error={fieldState.error?.message}
          />
        )}
      />
      <p className="text-xs text-ink-muted">
        {person.role === 'admin'
          ? 'Admins may join a study in any role.'
          : `As a ${person.role}, ${person.name} joins studies as a ${person.role}. Change their staff role first to give them another.`}
      </p>
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={addMembership.isPending}>
          Add to study
        </Button>
      </DialogActions>
    </form>
  );
}
