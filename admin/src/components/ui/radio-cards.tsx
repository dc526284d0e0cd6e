import { Description, Field, Label, Radio, RadioGroup } from '@headlessui/react';
import { cx } from './cx';
import { fieldRecipe, radioCardRecipe } from './recipes';

export interface RadioCardOption<Value extends string> {
  value: Value;
  label: string;
  description?: React.ReactNode;
  disabled?: boolean;
}

export interface RadioCardsProps<Value extends string> {
  /** Names the group for assistive technology. */
  label: string;
  hideLabel?: boolean;
  value: Value | undefined;
  onChange: (value: Value) => void;
  options: readonly RadioCardOption<Value>[];
  error?: string | undefined;
  disabled?: boolean;
  className?: string;
  columns?: 1 | 2;
}

/** A Headless UI RadioGroup drawn as selectable cards with a short explanation each; wire it through Controller. */
export function RadioCards<Value extends string>({
  label,
  hideLabel = false,
  value,
  onChange,
  options,
  error,
  disabled,
  className,
  columns = 1,
}: RadioCardsProps<Value>) {
  return (
    <RadioGroup
      value={value ?? null}
      onChange={(next: Value | null) => next !== null && onChange(next)}
      disabled={disabled}
      aria-label={label}
      aria-invalid={error ? true : undefined}
      className={cx('flex flex-col gap-1', className)}
    >
      {!hideLabel && (
        <span className={fieldRecipe.label} aria-hidden="true">
          {label}
        </span>
      )}
      <div className={cx(radioCardRecipe.group, columns === 2 && 'sm:grid-cols-2')}>
        {options.map((option) => (
          <Field key={option.value} disabled={option.disabled} className="contents">
            <Radio value={option.value} className={radioCardRecipe.option}>
              <span className={radioCardRecipe.dot} aria-hidden="true">
                <span className={radioCardRecipe.dotCenter} />
              </span>
              <span className="min-w-0">
                <Label className={radioCardRecipe.label}>{option.label}</Label>
                {option.description && (
                  <Description className={radioCardRecipe.description}>{option.description}</Description>
                )}
              </span>
            </Radio>
          </Field>
        ))}
      </div>
      {error && (
        <p className={fieldRecipe.error} role="alert">
          {error}
        </p>
      )}
    </RadioGroup>
  );
}
