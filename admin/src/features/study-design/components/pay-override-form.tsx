import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { formatMinor } from '@/lib/money';
import type { Condition } from '../api/get-conditions';
import type { Step } from '../api/get-steps';
import { useSetPayOverride } from '../api/set-pay-override';
import { conditionDisplayName } from '../utils/condition-name';
import {
  payOverrideInputSchema,
  withPlainPayMessages,
  type PayOverrideFormOutput,
  type PayOverrideFormValues,
} from '../api/step-schema';

const apiToFormField: Record<string, keyof PayOverrideFormValues> = {
  payMinor: 'pay',
  reason: 'reason',
  conditionId: 'conditionId',
};

export interface PayOverrideFormProps {
  studyId: string;
  currency: string;
  step: Step;
  conditions: readonly Condition[];
  onSaved: () => void;
  onCancel: () => void;
}

export function PayOverrideForm({ studyId, currency, step, conditions, onSaved, onCancel }: PayOverrideFormProps) {
  const setOverride = useSetPayOverride(studyId);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<PayOverrideFormValues, unknown, PayOverrideFormOutput>({
    resolver: zodResolver(payOverrideInputSchema(currency)),
    defaultValues: { conditionId: '', pay: '', reason: '' },
  });

  const onSubmit = handleSubmit(({ conditionId, payMinor, reason }) => {
    setOverride.mutate(
      { stepId: step.id, conditionId, body: { payMinor, reason } },
      {
        onSuccess: () => onSaved(),
        onError: (error) =>
          applyApiFieldErrors(
            withPlainPayMessages(error, currency),
            setError,
            (field) => apiToFormField[field] ?? null,
          ),
      },
    );
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="flex flex-col gap-3.5"
      aria-label={`Pay override for step ${step.position}`}
    >
      <Notice tone="caution">
        Unequal pay can make people in one condition more likely to stay or drop out, and that difference then looks
        like an effect of the condition. Use an exception only when the condition truly asks for more (or less), and say
        why.
      </Notice>
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <p className="text-sm text-ink-muted">
        Everyone else is paid {formatMinor(step.payMinor, currency)} for this step.
      </p>
      <Controller
        control={control}
        name="conditionId"
        render={({ field, fieldState }) => (
          <SelectField
            label="Condition"
            value={field.value === '' ? undefined : field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={conditions.map((condition) => ({
              value: condition.id,
              label: conditionDisplayName(condition),
              description: condition.participantLabel,
            }))}
            placeholder="Choose a condition"
            error={fieldState.error?.message}
          />
        )}
      />
      <TextField
        label={`Pay in this condition (${currency})`}
        inputMode="decimal"
        error={errors.pay?.message}
        className="max-w-48"
        {...register('pay')}
      />
      <TextAreaField
        label="Reason"
        hint="At least 10 characters. Kept in the record and shown with the flag in the dropout watch."
        error={errors.reason?.message}
        {...register('reason')}
      />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={setOverride.isPending}>
          Record exception
        </Button>
      </DialogActions>
    </form>
  );
}
