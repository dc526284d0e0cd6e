import { Description, Field, Input, Label, type InputProps } from '@headlessui/react';
import { cx } from './cx';
import { fieldRecipe, inputRecipe } from './recipes';

export interface TextFieldProps extends Omit<InputProps, 'className' | 'invalid'> {
  label: string;
  hint?: string;
  /** The field's validation message; also marks the input invalid and describes it for screen readers. */
  error?: string | undefined;
  className?: string;
  ref?: React.Ref<HTMLInputElement>;
}

export function TextField({ label, hint, error, className, disabled, ...inputProps }: TextFieldProps) {
  return (
    <Field className={cx(fieldRecipe.field, className)} disabled={disabled}>
      <Label className={fieldRecipe.label}>{label}</Label>
      <Input className={inputRecipe} invalid={Boolean(error)} {...inputProps} />
      {hint && !error && <Description className={fieldRecipe.hint}>{hint}</Description>}
      {error && <Description className={fieldRecipe.error}>{error}</Description>}
    </Field>
  );
}
