import { Field, Fieldset, Input, Label, Legend, Select } from '@headlessui/react';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { CheckboxField } from '@/components/ui/checkbox-field';
import { cx } from '@/components/ui/cx';
import { fieldRecipe, inputRecipe } from '@/components/ui/recipes';
import type { AuditFilterOptions } from '../api/get-audit-filters';
import { labChain, type ActionFamily, type AuditSelection } from '../utils/audit-selection';

export interface AuditFiltersProps {
  selection: AuditSelection;
  options: AuditFilterOptions | undefined;
  /** Gets how to change the selection, applied to the newest one (not to this render's). */
  onChange: (change: (current: AuditSelection) => AuditSelection) => void;
}

/** Narrow the trail: study, participant, staff member, dates and kinds of action (several at once). */
export function AuditFilters({ selection, options, onChange }: AuditFiltersProps) {
  const [participant, setParticipant] = useState(selection.participant ?? '');
  const [seen, setSeen] = useState(selection.participant);
  // The address changed from elsewhere (Clear, back button): show what it now says.
  if (seen !== selection.participant) {
    setSeen(selection.participant);
    setParticipant(selection.participant ?? '');
  }
  const set = (patch: Partial<AuditSelection>) => onChange((current) => ({ ...current, ...patch }));
  const toggleFamily = (family: ActionFamily, on: boolean) =>
    onChange((current) => {
      const others = current.families.filter((key) => key !== family);
      return { ...current, families: on ? [...others, family] : others };
    });

  return (
    <div className="flex flex-col gap-4 rounded-lg border border-line bg-sunken/60 p-3 sm:p-4">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[minmax(0,1.2fr)_minmax(0,1fr)_minmax(0,1.2fr)_auto_auto]">
        <form
          role="search"
          aria-label="Find a participant"
          className="flex items-end gap-2"
          onSubmit={(event) => {
            event.preventDefault();
            set({ participant: participant.trim() || null });
          }}
        >
          <Field className={cx(fieldRecipe.field, 'min-w-0 flex-1')}>
            <Label className={fieldRecipe.label}>Participant reference</Label>
            <Input
              className={inputRecipe}
              value={participant}
              placeholder="e.g. P-7KQ2XA"
              autoComplete="off"
              spellCheck={false}
              onChange={(event) => setParticipant(event.target.value)}
            />
          </Field>
          <Button type="submit">Show</Button>
        </form>
        <Field className={fieldRecipe.field}>
          <Label className={fieldRecipe.label}>Study</Label>
          <Select
            className={cx(inputRecipe, 'pr-8')}
            value={selection.chain ?? ''}
            onChange={(event) => set({ chain: event.target.value || null })}
          >
            <option value="">Every study and the lab</option>
            <option value={labChain}>Lab-wide events only</option>
            {options?.studies.map((study) => (
              <option key={study.id} value={study.id}>
                {study.title}
              </option>
            ))}
          </Select>
        </Field>
        <Field className={fieldRecipe.field}>
          <Label className={fieldRecipe.label}>Staff member</Label>
          <Select
            className={cx(inputRecipe, 'pr-8')}
            value={selection.staff ?? ''}
            onChange={(event) => set({ staff: event.target.value || null })}
          >
            <option value="">Anyone</option>
            {options?.staff.map((person) => (
              <option key={person.id} value={person.id}>
                {person.phrase} ({person.email})
              </option>
            ))}
          </Select>
        </Field>
        <Field className={fieldRecipe.field}>
          <Label className={fieldRecipe.label}>From</Label>
          <Input
            type="date"
            className={inputRecipe}
            value={selection.from ?? ''}
            max={selection.to ?? undefined}
            onChange={(event) => set({ from: event.target.value || null })}
          />
        </Field>
        <Field className={fieldRecipe.field}>
          <Label className={fieldRecipe.label}>To</Label>
          <Input
            type="date"
            className={inputRecipe}
            value={selection.to ?? ''}
            min={selection.from ?? undefined}
            onChange={(event) => set({ to: event.target.value || null })}
          />
        </Field>
      </div>
      <Fieldset className="flex flex-col gap-2">
        <Legend className={fieldRecipe.label}>
          Kinds of action{' '}
          {selection.families.length === 0 && (
            <span className="font-normal text-ink-muted">(all shown; tick some to narrow)</span>
          )}
        </Legend>
        <div className="grid grid-cols-2 gap-x-4 gap-y-1.5 sm:grid-cols-3 lg:grid-cols-5">
          {options?.families.map((family) => (
            <CheckboxField
              key={family.key}
              label={family.label}
              checked={selection.families.includes(family.key)}
              onChange={(on) => toggleFamily(family.key, on)}
            />
          ))}
        </div>
      </Fieldset>
    </div>
  );
}
