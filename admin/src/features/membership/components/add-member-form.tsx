import { zodResolver } from '@hookform/resolvers/zod';
import { Input } from '@headlessui/react';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { inputRecipe } from '@/components/ui/recipes';
import { SelectField, type SelectOption } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { useDebouncedValue } from '@/hooks/use-debounced-value';
import { roleLabels, type StaffRole } from '@/lib/role-access';
import { useAddMembership } from '../api/change-membership';
import { useStaffChoices } from '../api/get-staff-choices';
import { addMemberInputSchema, type AddMemberInput } from '../api/membership-form-schema';
import { fittingMembershipRoles, type StudyMember } from '../api/membership-keys';
import { membershipErrorMessage, membershipRoleLabels } from './membership-labels';

export interface AddMemberFormProps {
  studyId: string;
  members: readonly StudyMember[];
  onAdded: (name: string) => void;
  onCancel: () => void;
}

/** Adds a staff member to one study; only the membership roles their staff role allows are offered. */
export function AddMemberForm({ studyId, members, onAdded, onCancel }: AddMemberFormProps) {
  const [searchText, setSearchText] = useState('');
  const search = useDebouncedValue(searchText.trim(), 250);
  const choices = useStaffChoices(search);
  const addMembership = useAddMembership();
  const { control, handleSubmit, setValue, formState } = useForm<AddMemberInput>({
    resolver: zodResolver(addMemberInputSchema),
  });
  // Kept apart from the search results, so a new search does not forget whom was chosen.
  const [chosen, setChosen] = useState<{ name: string; email: string; role: StaffRole } | null>(null);

  const memberIds = new Set(members.map((member) => member.userId));
  const candidates = (choices.data?.items ?? []).filter((user) => !memberIds.has(user.id));
  const shownPeople =
    chosen && !candidates.some((user) => user.email === chosen.email) ? [chosen, ...candidates] : candidates;
  const personOptions: SelectOption<string>[] = shownPeople.map((user) => ({
    value: user.email,
    label: user.name || user.email,
    description: `${roleLabels[user.role]} · ${user.email}`,
  }));
  // Until the list matches what was typed, it cannot be opened: a list that changes under the pointer picks the wrong
  // person or lands the click outside the dialog.
  const searching = searchText.trim() !== search || choices.isFetching;
  const roleOptions = chosen ? fittingMembershipRoles(chosen.role).map((role) => membershipRoleLabels[role]) : [];

  const onSubmit = handleSubmit((input) => {
    addMembership.mutate({ studyId, ...input }, { onSuccess: () => onAdded(chosen?.name || input.email) });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label="Add a member">
      {addMembership.isError && (
        <Notice>{membershipErrorMessage(addMembership.error, 'The member could not be added. Try again.')}</Notice>
      )}
      <label className="flex flex-col gap-1">
        <span className="text-xs font-semibold text-ink">Find a staff member</span>
        <Input
          type="search"
          value={searchText}
          onChange={(event) => setSearchText(event.target.value)}
          placeholder="Name or e-mail"
          className={inputRecipe}
        />
      </label>
      <Controller
        control={control}
        name="email"
        render={({ field, fieldState }) => (
          <SelectField
            label="Staff member"
            value={field.value}
            onChange={(next) => {
              field.onChange(next);
              // A person with one fitting role gets it chosen; an admin picks one of three.
              const person = shownPeople.find((user) => user.email === next);
              setChosen(person ? { name: person.name, email: person.email, role: person.role as StaffRole } : null);
              const fitting = person ? fittingMembershipRoles(person.role as StaffRole) : [];
              setValue('role', fitting.length === 1 ? fitting[0]! : (undefined as never), {
                shouldValidate: fitting.length === 1,
              });
            }}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={personOptions}
            placeholder={
              searching ? 'Searching…' : personOptions.length === 0 ? 'No one else to add' : 'Choose a person…'
            }
            disabled={searching || personOptions.length === 0}
            error={fieldState.error?.message}
          />
        )}
      />
      <Controller
        control={control}
        name="role"
        render={({ field, fieldState }) => (
          <SelectField
            label="Role in this study"
            value={field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={roleOptions}
            placeholder={chosen ? 'Choose a role…' : 'Choose a person first'}
            disabled={!chosen}
            error={fieldState.error?.message}
          />
        )}
      />
      <p className="text-xs text-ink-muted">
        A member’s role in a study matches their staff role, so a coordinator joins as a coordinator; admins may join in
        any role.
      </p>
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={addMembership.isPending} disabled={formState.isSubmitting}>
          Add to study
        </Button>
      </DialogActions>
    </form>
  );
}
