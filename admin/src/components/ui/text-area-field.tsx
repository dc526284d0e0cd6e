import { Description, Field, Label, Textarea, type TextareaProps } from '@headlessui/react';
import { cx } from './cx';
import { fieldRecipe, textareaRecipe } from './recipes';

export interface TextAreaFieldProps extends Omit<TextareaProps, 'className' | 'invalid'> {
  label: string;
  hint?: string;
  error?: string | undefined;
  className?: string;
  ref?: React.Ref<HTMLTextAreaElement>;
}

export function TextAreaField({
  label,
  hint,
  error,
  className,
  disabled,
  rows = 3,
  ...textareaProps
}: TextAreaFieldProps) {
  return (
    <Field className={cx(fieldRecipe.field, className)} disabled={disabled}>
      <Label className={fieldRecipe.label}>{label}</Label>
      <Textarea className={textareaRecipe} invalid={Boolean(error)} rows={rows} {...textareaProps} />
      {hint && !error && <Description className={fieldRecipe.hint}>{hint}</Description>}
      {error && <Description className={fieldRecipe.error}>{error}</Description>}
    </Field>
  );
}
