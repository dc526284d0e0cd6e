import { Textarea } from '@headlessui/react';
import type { ComponentPropsWithRef } from 'react';
import { LabelledField, type LabelledFieldProps } from './labelled-field';

type TextAreaFieldProps = Omit<ComponentPropsWithRef<'textarea'>, 'className' | 'children'> & LabelledFieldProps;

const textareaClasses =
  'block w-full min-h-28 rounded-soft border-2 border-edge bg-paper-raised px-4 py-3 text-body text-ink ' +
  'data-focus:border-lagoon data-invalid:border-ember data-disabled:opacity-60';

/** A labelled multi-line input; hint and error are announced with it. */
export function TextAreaField({ label, hint, error, disabled, ...textareaProps }: TextAreaFieldProps) {
  return (
    <LabelledField label={label} hint={hint} error={error} disabled={disabled}>
      <Textarea {...textareaProps} invalid={Boolean(error)} className={textareaClasses} />
    </LabelledField>
  );
}
