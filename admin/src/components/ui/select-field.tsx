import { Description, Field, Label, Listbox, ListboxButton, ListboxOption, ListboxOptions } from '@headlessui/react';
import { cx } from './cx';
import { fieldRecipe, listboxRecipe } from './recipes';

export interface SelectOption<Value extends string> {
  value: Value;
  label: string;
  description?: string;
}

export interface SelectFieldProps<Value extends string> {
  label: string;
  value: Value | undefined;
  onChange: (value: Value) => void;
  onBlur?: () => void;
  options: readonly SelectOption<Value>[];
  error?: string | undefined;
  disabled?: boolean;
  placeholder?: string;
  className?: string;
  buttonRef?: React.Ref<HTMLButtonElement>;
}

/** A labelled Headless UI Listbox; wire it to react-hook-form through Controller. */
export function SelectField<Value extends string>({
  label,
  value,
  onChange,
  onBlur,
  options,
  error,
  disabled,
  placeholder = 'Choose…',
  className,
  buttonRef,
}: SelectFieldProps<Value>) {
  const selected = options.find((option) => option.value === value);
  return (
    <Field className={cx(fieldRecipe.field, className)} disabled={disabled}>
      <Label className={fieldRecipe.label}>{label}</Label>
      <Listbox
        value={value ?? null}
        onChange={(next: Value | null) => next !== null && onChange(next)}
        invalid={Boolean(error)}
      >
        <ListboxButton ref={buttonRef} className={listboxRecipe.button} onBlur={onBlur}>
          <span className={selected ? undefined : 'text-ink-faint'}>{selected?.label ?? placeholder}</span>
          <svg className="size-3.5 text-ink-muted" viewBox="0 0 16 16" fill="none" aria-hidden="true">
            <path
              d="M4.5 6.5 8 10l3.5-3.5"
              stroke="currentColor"
              strokeWidth="1.6"
              strokeLinecap="round"
              strokeLinejoin="round"
            />
          </svg>
        </ListboxButton>
        <ListboxOptions anchor="bottom start" className={listboxRecipe.options}>
          {options.map((option) => (
            <ListboxOption key={option.value} value={option.value} className={listboxRecipe.option}>
              <svg
                className="mt-0.5 size-3.5 shrink-0 text-spruce invisible group-data-selected:visible"
                viewBox="0 0 16 16"
                fill="none"
                aria-hidden="true"
              >
                <path
                  d="m3.5 8.5 3 3 6-7"
                  stroke="currentColor"
                  strokeWidth="1.8"
                  strokeLinecap="round"
                  strokeLinejoin="round"
                />
              </svg>
              <span>
                {option.label}
                {option.description && <span className={listboxRecipe.optionDescription}>{option.description}</span>}
              </span>
            </ListboxOption>
          ))}
        </ListboxOptions>
      </Listbox>
      {error && <Description className={fieldRecipe.error}>{error}</Description>}
    </Field>
  );
}
