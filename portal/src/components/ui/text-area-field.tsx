import { Description, Field, Label, Textarea } from '@headlessui/react';
import type { ComponentPropsWithRef } from 'react';

type TextAreaFieldProps = Omit<ComponentPropsWithRef<'textarea'>, 'className' | 'children'> & {
  label: string;
  hint?: string;
  error?: string | undefined;
};

const textareaClasses =
  'block w-full min-h-28 rounded-soft border-2 border-edge bg-paper-raised px-4 py-3 text-body text-ink ' +
  'data-focus:border-lagoon data-invalid:border-ember data-disabled:opacity-60';

export function TextAreaField({ label, hint, error, disabled, ...textareaProps }: TextAreaFieldProps) {
  return (
    <Field disabled={disabled} className="flex flex-col gap-2">
      <Label className="text-body font-semibold text-ink">{label}</Label>
      {hint ? <Description className="text-fine text-ink-soft">{hint}</Description> : null}
      <Textarea {...textareaProps} invalid={Boolean(error)} className={textareaClasses} />
      {error ? (
        <Description role="alert" className="flex items-start gap-2 text-fine font-semibold text-ember">
          <span aria-hidden="true">⚠</span>
          <span>{error}</span>
        </Description>
      ) : null}
    </Field>
  );
}
