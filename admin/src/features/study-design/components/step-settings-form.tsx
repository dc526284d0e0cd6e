import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { RadioCards } from '@/components/ui/radio-cards';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import type { Step } from '../api/get-steps';
import {
  stepSettingsInputSchema,
  useSaveStepSettings,
  type StepSettingsBody,
  type StepSettingsFormValues,
} from '../api/save-step-settings';
import { verificationOrder, verificationWording } from '../utils/step-settings-wording';

const apiToFormField: Record<string, keyof StepSettingsFormValues> = {
  verification: 'verification',
  taskUrl: 'taskUrl',
  sharedCode: 'sharedCode',
  opensAfterDays: 'opensAfterDays',
  opensFrom: 'opensFrom',
  dueWithinDays: 'dueWithinDays',
};

const opensFromOptions = [
  { value: 'assignment', label: 'after assignment' },
  { value: 'previous-step', label: 'after the previous step is done' },
] as const;

export interface StepSettingsFormProps {
  studyId: string;
  step: Step;
  onSaved: () => void;
  onCancel: () => void;
}

/** How one step is checked, and when it opens and is due. */
export function StepSettingsForm({ studyId, step, onSaved, onCancel }: StepSettingsFormProps) {
  const save = useSaveStepSettings(studyId);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<StepSettingsFormValues, unknown, StepSettingsBody>({
    resolver: zodResolver(stepSettingsInputSchema({ hasSharedCode: step.hasCompletionCode })),
    defaultValues: {
      verification: step.verification,
      taskUrl: step.taskUrl ?? '',
      sharedCode: '',
      opensAfterDays: String(step.opensAfterDays),
      opensFrom: step.opensFrom,
      dueMode: step.dueWithinDays === null ? 'none' : 'within',
      dueWithinDays: step.dueWithinDays === null ? '' : String(step.dueWithinDays),
    },
  });
  const verification = useWatch({ control, name: 'verification' });
  const dueMode = useWatch({ control, name: 'dueMode' });

  const onSubmit = handleSubmit((body) =>
    save.mutate(
      { stepId: step.id, body },
      {
        onSuccess: () => onSaved(),
        onError: (error) => applyApiFieldErrors(error, setError, (field) => apiToFormField[field] ?? null),
      },
    ),
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="flex flex-col gap-4"
      aria-label={`How step ${step.position} is checked`}
    >
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <Controller
        control={control}
        name="verification"
        render={({ field }) => (
          <RadioCards
            label="How a completion is checked"
            value={field.value}
            onChange={field.onChange}
            error={errors.verification?.message}
            options={verificationOrder.map((value) => ({
              value,
              label: verificationWording[value].label,
              description: verificationWording[value].description,
            }))}
          />
        )}
      />

      {verification === 'return-link' && (
        <TextField
          label="Address of the external task"
          type="url"
          inputMode="url"
          autoComplete="off"
          placeholder="https://tasks.example.org/session-1"
          hint="Evenhand adds the participant’s reference and a signed return address to it; see “Return address for your external task” below."
          error={errors.taskUrl?.message}
          {...register('taskUrl')}
        />
      )}

      {verification === 'shared-code' && (
        <div className="flex flex-col gap-2">
          <Notice tone="caution">
            Anyone who learns this code can claim the step’s pay, including people who never did the task. Use a code
            for each participant or a return link when the pay matters.
          </Notice>
          <TextField
            label={
              step.hasCompletionCode ? 'New code (leave empty to keep the current one)' : 'The code everyone types'
            }
            autoComplete="off"
            hint="4 to 64 characters. Evenhand keeps only a fingerprint of it, so write it down where your task shows it."
            error={errors.sharedCode?.message}
            className="max-w-72"
            {...register('sharedCode')}
          />
        </div>
      )}

      <fieldset className="flex flex-col gap-3 rounded-md border border-line px-3 pt-2 pb-3">
        <legend className="px-1 text-xs font-semibold text-ink">When it can be done</legend>
        <div className="flex flex-wrap items-start gap-3">
          <TextField
            label="Opens after (days)"
            inputMode="numeric"
            error={errors.opensAfterDays?.message}
            className="w-32"
            {...register('opensAfterDays')}
          />
          <Controller
            control={control}
            name="opensFrom"
            render={({ field }) => (
              <SelectField
                label="Counted from"
                value={field.value}
                onChange={field.onChange}
                onBlur={field.onBlur}
                buttonRef={field.ref}
                options={opensFromOptions}
                error={errors.opensFrom?.message}
                className="min-w-56 flex-1"
              />
            )}
          />
        </div>
        <Controller
          control={control}
          name="dueMode"
          render={({ field }) => (
            <RadioCards
              label="Due date"
              columns={2}
              value={field.value}
              onChange={field.onChange}
              options={[
                {
                  value: 'within',
                  label: 'Due within a number of days',
                  description: 'Counted from the day it opens; late work still counts.',
                },
                {
                  value: 'none',
                  label: 'No due date',
                  description: 'The step stays open until the participant finishes.',
                },
              ]}
            />
          )}
        />
        {dueMode === 'within' && (
          <TextField
            label="Due within (days)"
            inputMode="numeric"
            error={errors.dueWithinDays?.message}
            className="w-32"
            {...register('dueWithinDays')}
          />
        )}
      </fieldset>

      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={save.isPending}>
          Save how it is checked
        </Button>
      </DialogActions>
    </form>
  );
}
