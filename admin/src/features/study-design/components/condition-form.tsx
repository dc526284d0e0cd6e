import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { conditionInputSchema, newConditionInputSchema, type ConditionFormValues } from '../api/condition-schema';
import { useCreateCondition } from '../api/create-condition';
import type { Condition } from '../api/get-conditions';
import { useUpdateCondition } from '../api/update-condition';

const formFields: readonly (keyof ConditionFormValues)[] = [
  'internalName',
  'participantLabel',
  'participantInstructions',
  'allocationWeight',
];

export interface ConditionFormProps {
  studyId: string;
  /** The condition being edited; absent when adding. */
  condition?: Condition;
  /** Within-subjects designs hand out orders, so weights play no part. */
  showWeight: boolean;
  /** Weights belong to the sealed design: fixed after the first assignment. */
  weightLocked: boolean;
  onSaved: (condition: Condition) => void;
  onCancel: () => void;
}

export function ConditionForm({ studyId, condition, showWeight, weightLocked, onSaved, onCancel }: ConditionFormProps) {
  const create = useCreateCondition(studyId);
  const update = useUpdateCondition(studyId);
  const nameHidden = condition !== undefined && condition.internalName === null;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ConditionFormValues>({
    resolver: zodResolver(condition ? conditionInputSchema : newConditionInputSchema),
    defaultValues: {
      internalName: condition?.internalName ?? '',
      participantLabel: condition?.participantLabel ?? '',
      participantInstructions: condition?.participantInstructions ?? '',
      allocationWeight: String(condition?.allocationWeight ?? 1),
    },
  });

  const onError = (error: unknown) =>
    applyApiFieldErrors(error, setError, (field) =>
      (formFields as readonly string[]).includes(field) ? (field as keyof ConditionFormValues) : null,
    );

  const onSubmit = handleSubmit((values) => {
    const weight = Number(values.allocationWeight);
    if (!condition) {
      create.mutate(
        {
          internalName: values.internalName,
          participantLabel: values.participantLabel,
          participantInstructions: values.participantInstructions,
          allocationWeight: showWeight ? weight : 1,
        },
        { onSuccess: (saved) => onSaved(saved), onError },
      );
      return;
    }
    const body = {
      ...(values.internalName !== '' && values.internalName !== condition.internalName
        ? { internalName: values.internalName }
        : {}),
      ...(values.participantLabel !== condition.participantLabel ? { participantLabel: values.participantLabel } : {}),
      ...(values.participantInstructions !== condition.participantInstructions
        ? { participantInstructions: values.participantInstructions }
        : {}),
      ...(showWeight && !weightLocked && weight !== condition.allocationWeight ? { allocationWeight: weight } : {}),
    };
    if (Object.keys(body).length === 0) {
      onSaved(condition);
      return;
    }
    update.mutate({ conditionId: condition.id, body }, { onSuccess: (saved) => onSaved(saved), onError });
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="flex flex-col gap-3.5"
      aria-label={condition ? `Edit condition ${condition.code}` : 'New condition'}
    >
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField
        label="Internal name"
        autoComplete="off"
        hint={
          nameHidden
            ? 'Hidden while the study is blinded. Leave empty to keep the saved name.'
            : 'What the study team calls it, e.g. “audio cues”. Participants never see it.'
        }
        placeholder={nameHidden ? 'Hidden while blinded' : undefined}
        error={errors.internalName?.message}
        {...register('internalName')}
      />
      <TextField
        label="Participant label"
        autoComplete="off"
        hint="The neutral name participants see, e.g. “Route guide, version 1”."
        error={errors.participantLabel?.message}
        {...register('participantLabel')}
      />
      <TextAreaField
        label="Instructions for participants"
        rows={4}
        hint="Shown to participants in this condition right after they sign."
        error={errors.participantInstructions?.message}
        {...register('participantInstructions')}
      />
      {showWeight && (
        <TextField
          label="Allocation weight"
          inputMode="numeric"
          disabled={weightLocked}
          hint={
            weightLocked
              ? 'Fixed since the first assignment.'
              : 'Relative share of participants: weights 2, 1, 1 send half of everyone here. Most studies use 1 for every condition.'
          }
          error={errors.allocationWeight?.message}
          {...register('allocationWeight')}
        />
      )}
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={create.isPending || update.isPending}>
          {condition ? 'Save condition' : 'Add condition'}
        </Button>
      </DialogActions>
    </form>
  );
}
