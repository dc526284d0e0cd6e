import { Description, Field, Label, Switch } from '@headlessui/react';
import { cx } from './cx';
import { fieldRecipe, switchRecipe } from './recipes';

export interface SwitchFieldProps {
  label: string;
  hint?: React.ReactNode;
  checked: boolean;
  onChange: (checked: boolean) => void;
  disabled?: boolean;
  className?: string;
}

export function SwitchField({ label, hint, checked, onChange, disabled, className }: SwitchFieldProps) {
  return (
    <Field className={cx('flex items-start gap-3', className)} disabled={disabled}>
      <Switch checked={checked} onChange={onChange} className={cx(switchRecipe.track, 'mt-0.5')}>
        <span className={switchRecipe.thumb} aria-hidden="true" />
      </Switch>
      <span className="flex flex-col">
        <Label className={cx(fieldRecipe.label, 'cursor-pointer')}>{label}</Label>
        {hint && <Description className="text-xs text-ink-muted">{hint}</Description>}
      </span>
    </Field>
  );
}
