import { Description, Field, Label, Radio, RadioGroup } from '@headlessui/react';
import { type Ref, useImperativeHandle, useRef } from 'react';

export type RadioChoiceOption = { value: string; label: string };

type RadioChoiceProps = {
  label: string;
  hint?: string | undefined;
  error?: string | undefined;
  options: RadioChoiceOption[];
  value: string;
  onChange: (value: string) => void;
  onBlur?: () => void;
  disabled?: boolean;
  /** react-hook-form focuses this on a validation error; it moves focus to the radio a keyboard user would land on. */
  ref?: Ref<{ focus: () => void }>;
};

const optionClasses =
  'flex min-h-12 cursor-pointer items-center gap-3 rounded-soft border-2 border-sand-deep bg-paper-raised px-4 py-3 ' +
  'has-[[data-checked]]:border-clay has-[[data-checked]]:bg-clay-tint has-[[data-focus]]:border-lagoon';

const radioClasses =
  'group flex size-6 shrink-0 items-center justify-center rounded-full border-2 border-edge bg-white ' +
  'data-checked:border-clay data-checked:bg-clay';

/**
 * One answer out of a few, as big tappable rows. The question is a Headless UI Label inside the group, and the hint
 * and error are Descriptions, because the group sets its own aria-labelledby and aria-describedby from those.
 */
export function RadioChoice({ label, hint, error, options, value, onChange, onBlur, disabled, ref }: RadioChoiceProps) {
  const groupRef = useRef<HTMLDivElement>(null);
  useImperativeHandle(ref, () => ({
    focus: () => {
      const radios = groupRef.current?.querySelectorAll<HTMLElement>('[role="radio"]');
      const reachable = [...(radios ?? [])].find((radio) => radio.tabIndex === 0) ?? radios?.[0];
      reachable?.focus();
    },
  }));

  return (
    <RadioGroup
      ref={groupRef}
      value={value}
      onChange={onChange}
      onBlur={onBlur}
      disabled={disabled}
      aria-invalid={error ? true : undefined}
      className="flex flex-col gap-2"
    >
      <Label className="text-body font-semibold text-ink">{label}</Label>
      {hint ? <Description className="text-fine text-ink-soft">{hint}</Description> : null}
      {options.map((option) => (
        <Field key={option.value} className={optionClasses}>
          <Radio value={option.value} className={radioClasses}>
            <span className="invisible size-2.5 rounded-full bg-white group-data-checked:visible" />
          </Radio>
          <Label className="flex-1 cursor-pointer text-body">{option.label}</Label>
        </Field>
      ))}
      {error ? (
        <Description role="alert" className="flex items-start gap-2 text-fine font-semibold text-ember">
          <span aria-hidden="true">⚠</span>
          <span>{error}</span>
        </Description>
      ) : null}
    </RadioGroup>
  );
}
