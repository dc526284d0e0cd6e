import { Description, Field, Input, Label } from '@headlessui/react';
import type { ComponentPropsWithRef } from 'react';

type TextFieldProps = Omit<ComponentPropsWithRef<'input'>, 'className' | 'children'> & {
  label: string;
  hint?: string;
  error?: string | undefined;
};

const inputClasses =
  'block w-full min-h-12 rounded-soft border-2 border-edge bg-paper-raised px-4 py-3 text-lead text-ink ' +
  'placeholder:text-ink-soft/70 data-focus:border-lagoon data-invalid:border-ember data-disabled:opacity-60';

/** A labelled text input; hint and error are announced with it (Headless UI wires aria-describedby). */
export function TextField({ label, hint, error, disabled, ...inputProps }: TextFieldProps) {
  return (
    <Field disabled={disabled} className="flex flex-col gap-2">
      <Label className="text-body font-semibold text-ink">{label}</Label>
      {hint ? <Description className="text-fine text-ink-soft">{hint}</Description> : null}
      <Input {...inputProps} invalid={Boolean(error)} className={inputClasses} />
      {error ? (
        <Description role="alert" className="flex items-start gap-2 text-fine font-semibold text-ember">
          <span aria-hidden="true">⚠</span>
          <span>{error}</span>
        </Description>
      ) : null}
    </Field>
  );
}
