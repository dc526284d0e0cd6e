import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { minorToMajorText } from '@/lib/money';
import { useCreateStep } from '../api/create-step';
import type { Step } from '../api/get-steps';
import { stepInputSchema, withPlainPayMessages, type StepFormOutput, type StepFormValues } from '../api/step-schema';
import { useUpdateStep } from '../api/update-step';

const apiToFormField: Record<string, keyof StepFormValues> = {
  title: 'title',
  description: 'description',
  payMinor: 'pay',
  position: 'position',
};

export interface StepFormProps {
  studyId: string;
  currency: string;
  step?: Step;
  stepCount: number;
  onSaved: () => void;
  onCancel: () => void;
}

export function StepForm({ studyId, currency, step, stepCount, onSaved, onCancel }: StepFormProps) {
  const create = useCreateStep(studyId);
  const update = useUpdateStep(studyId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<StepFormValues, unknown, StepFormOutput>({
    resolver: zodResolver(stepInputSchema(currency)),
    defaultValues: {
      title: step?.title ?? '',
      description: step?.description ?? '',
      pay: step ? minorToMajorText(step.payMinor, currency) : '',
      position: '',
    },
  });

  const onError = (error: unknown) =>
    applyApiFieldErrors(withPlainPayMessages(error, currency), setError, (field) => apiToFormField[field] ?? null);

  const onSubmit = handleSubmit((values) => {
    if (!step) {
      create.mutate(
        {
          title: values.title,
          description: values.description,
          payMinor: values.payMinor,
          ...(values.position !== undefined ? { position: values.position } : {}),
        },
        { onSuccess: () => onSaved(), onError },
      );
      return;
    }
    update.mutate(
      { stepId: step.id, body: { title: values.title, description: values.description, payMinor: values.payMinor } },
      { onSuccess: () => onSaved(), onError },
    );
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="flex flex-col gap-3.5"
      aria-label={step ? `Edit step ${step.position}` : 'New step'}
    >
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField
        label="Step title"
        autoComplete="off"
        hint="E.g. “Session 1: learning the route”."
        error={errors.title?.message}
        {...register('title')}
      />
      <TextAreaField
        label="Description"
        hint="What the participant does and how long it takes; shown on the study page."
        error={errors.description?.message}
        {...register('description')}
      />
      <TextField
        label={`Pay (${currency})`}
        inputMode="decimal"
        hint="The same amount in every condition, e.g. 10 or 12.50."
        error={errors.pay?.message}
        className="max-w-48"
        {...register('pay')}
      />
      {!step && stepCount > 0 && (
        <TextField
          label="Place in the order"
          inputMode="numeric"
          hint={`1 to ${stepCount + 1}; leave empty to add it last.`}
          error={errors.position?.message}
          className="max-w-48"
          {...register('position')}
        />
      )}
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={create.isPending || update.isPending}>
          {step ? 'Save step' : 'Add step'}
        </Button>
      </DialogActions>
    </form>
  );
}
