import { Field, Label, Listbox, ListboxButton, ListboxOption, ListboxOptions } from '@headlessui/react';
import { type Ref, useId } from 'react';
import { FieldError } from './field-error';

type SelectListProps = {
  label: string;
  hint?: string | undefined;
  error?: string | undefined;
  options: string[];
  value: string;
  onChange: (value: string) => void;
  onBlur?: () => void;
  placeholder?: string;
  ref?: Ref<HTMLButtonElement>;
};

const buttonClasses =
  'flex min-h-12 w-full items-center justify-between gap-3 rounded-soft border-2 border-edge bg-paper-raised px-4 py-3 ' +
  'text-left text-lead text-ink data-focus:border-lagoon data-invalid:border-ember data-open:border-lagoon';

const optionsClasses =
  'z-20 w-(--button-width) rounded-soft border-2 border-edge bg-paper-raised py-1 shadow-card [--anchor-gap:0.25rem] ' +
  'focus:outline-none';

const optionClasses =
  'flex min-h-12 cursor-pointer items-center gap-3 px-4 py-2 text-body data-focus:bg-clay-tint data-selected:font-bold';

/** One answer out of many, as a list that opens; for a handful of answers use RadioChoice instead. */
export function SelectList({
  label,
  hint,
  error,
  options,
  value,
  onChange,
  onBlur,
  placeholder = 'Choose an answer',
  ref,
}: SelectListProps) {
  const id = useId();
  return (
    <Field className="flex flex-col gap-2">
      <Label className="text-body font-semibold text-ink">{label}</Label>
      {hint ? <p className="text-fine text-ink-soft">{hint}</p> : null}
      <Listbox value={value} onChange={onChange} invalid={Boolean(error)}>
        <ListboxButton
          ref={ref}
          onBlur={onBlur}
          aria-describedby={error ? `${id}-error` : undefined}
          className={buttonClasses}
        >
          <span className={value ? '' : 'text-ink-soft'}>{value || placeholder}</span>
          <span aria-hidden="true">▾</span>
        </ListboxButton>
        <ListboxOptions anchor="bottom start" className={optionsClasses}>
          {options.map((option) => (
            <ListboxOption key={option} value={option} className={optionClasses}>
              <span aria-hidden="true" className="invisible text-clay in-data-selected:visible">
                ✓
              </span>
              {option}
            </ListboxOption>
          ))}
        </ListboxOptions>
      </Listbox>
      {error ? <FieldError id={`${id}-error`}>{error}</FieldError> : null}
    </Field>
  );
}
