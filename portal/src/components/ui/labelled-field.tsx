import { Description, Field, Label } from '@headlessui/react';
import type { ReactNode } from 'react';

export interface LabelledFieldProps {
  label: string;
  hint?: string | undefined;
  error?: string | undefined;
  disabled?: boolean | undefined;
}

/**
 * The frame every text control sits in: label, hint, the control, then its error. Headless UI's Field wires the
 * label and both descriptions to the control (aria-labelledby, aria-describedby), so they are announced with it.
 */
export function LabelledField({
  label,
  hint,
  error,
  disabled,
  children,
}: LabelledFieldProps & { children: ReactNode }) {
  return (
    <Field disabled={disabled} className="flex flex-col gap-2">
      <Label className="text-body font-semibold text-ink">{label}</Label>
      {hint ? <Description className="text-fine text-ink-soft">{hint}</Description> : null}
      {children}
      {error ? (
        <Description role="alert" className="flex items-start gap-2 text-fine font-semibold text-ember">
          <span aria-hidden="true">⚠</span>
          <span>{error}</span>
        </Description>
      ) : null}
    </Field>
  );
}
