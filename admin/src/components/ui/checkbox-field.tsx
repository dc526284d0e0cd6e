import { Checkbox, Description, Field, Label } from '@headlessui/react';
import { cx } from './cx';
import { checkboxRecipe, fieldRecipe } from './recipes';

export interface CheckboxFieldProps {
  label: React.ReactNode;
  hint?: React.ReactNode;
  checked: boolean;
  onChange: (checked: boolean) => void;
  disabled?: boolean;
  error?: string | undefined;
  className?: string;
}

export function CheckboxField({ label, hint, checked, onChange, disabled, error, className }: CheckboxFieldProps) {
  return (
    <Field className={cx('flex items-start gap-2.5', className)} disabled={disabled}>
      <Checkbox
        checked={checked}
        onChange={onChange}
        aria-invalid={error ? true : undefined}
        className={cx(checkboxRecipe, 'mt-0.5')}
      >
        <svg
          className="size-3 text-ink-inverse invisible group-data-checked:visible"
          viewBox="0 0 16 16"
          fill="none"
          aria-hidden="true"
        >
          <path
            d="m3.5 8.5 3 3 6-7"
            stroke="currentColor"
            strokeWidth="2.2"
            strokeLinecap="round"
            strokeLinejoin="round"
          />
        </svg>
      </Checkbox>
      <span className="flex flex-col">
        <Label className="cursor-pointer text-sm text-ink">{label}</Label>
        {hint && <Description className="text-xs text-ink-muted">{hint}</Description>}
        {error && <Description className={fieldRecipe.error}>{error}</Description>}
      </span>
    </Field>
  );
}
