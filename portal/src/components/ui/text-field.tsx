import { Input } from '@headlessui/react';
import type { ComponentPropsWithRef } from 'react';
import { LabelledField, type LabelledFieldProps } from './labelled-field';

type TextFieldProps = Omit<ComponentPropsWithRef<'input'>, 'className' | 'children'> & LabelledFieldProps;

const inputClasses =
  'block w-full min-h-12 rounded-soft border-2 border-edge bg-paper-raised px-4 py-3 text-lead text-ink ' +
  'placeholder:text-ink-soft/70 data-focus:border-lagoon data-invalid:border-ember data-disabled:opacity-60';

/** A labelled text input; hint and error are announced with it. */
export function TextField({ label, hint, error, disabled, ...inputProps }: TextFieldProps) {
  return (
    <LabelledField label={label} hint={hint} error={error} disabled={disabled}>
      <Input {...inputProps} invalid={Boolean(error)} className={inputClasses} />
    </LabelledField>
  );
}
