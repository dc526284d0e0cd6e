import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useFieldArray, useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { CheckboxField } from '@/components/ui/checkbox-field';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { parseLines } from '@/lib/number-list';
import type { ScreeningQuestion } from '../api/get-screening-questions';
import { useReplaceScreeningQuestions, type ScreeningQuestionInput } from '../api/replace-screening-questions';
import { emptyScreeningRow, screeningFormSchema, type ScreeningFormValues } from '../api/screening-schema';

const kindOptions = [
  { value: 'yes-no', label: 'Yes or no' },
  { value: 'number', label: 'A number' },
  { value: 'choice', label: 'One of several options' },
] as const;

const yesNoRuleOptions = [
  { value: 'yes', label: 'Only “yes” may take part' },
  { value: 'no', label: 'Only “no” may take part' },
  { value: 'any', label: 'Either answer may take part' },
] as const;

const apiRowFields: Record<string, string> = {
  key: 'key',
  label: 'label',
  kind: 'kind',
  options: 'options',
  minValue: 'minValue',
  maxValue: 'maxValue',
  help: 'help',
  criterion: 'criterion',
  eligibleMin: 'eligibleMin',
  eligibleMax: 'eligibleMax',
  eligibleValues: 'eligibleOptions',
};

export interface ScreeningFormProps {
  studyId: string;
  questions: readonly ScreeningQuestion[];
  factorKeys: readonly string[];
  onSaved: () => void;
  onCancel: () => void;
}

export function ScreeningForm({ studyId, questions, factorKeys, onSaved, onCancel }: ScreeningFormProps) {
  const replace = useReplaceScreeningQuestions(studyId);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ScreeningFormValues, unknown, ScreeningQuestionInput[]>({
    resolver: zodResolver(screeningFormSchema(factorKeys)),
    defaultValues: {
      // The api does not send saved rules back, so each saved question starts with its rule to be set again.
      questions: questions.map((question) => ({
        ...emptyScreeningRow,
        key: question.key,
        label: question.label,
        kind: question.kind,
        options: (question.options ?? []).join('\n'),
        minValue: question.min === undefined ? '' : String(question.min),
        maxValue: question.max === undefined ? '' : String(question.max),
        help: question.help ?? '',
      })),
    },
  });
  const { fields, append, remove } = useFieldArray({ control, name: 'questions' });
  const rows = useWatch({ control, name: 'questions' }) ?? [];

  const onSubmit = handleSubmit((input) => {
    replace.mutate(input, {
      onSuccess: () => onSaved(),
      onError: (error) =>
        applyApiFieldErrors(error, setError, (field) => {
          const match = /^questions\.(\d+)\.(\w+)/.exec(field);
          const rowField = match ? apiRowFields[match[2] ?? ''] : undefined;
          return match && rowField ? (`questions.${Number(match[1])}.${rowField}` as `questions.${number}.key`) : null;
        }),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Screening questions">
      {questions.length > 0 && (
        <Notice tone="caution">
          Saving replaces every eligibility question. Saved eligibility rules are not shown here, so set each question’s
          rule again before you save.
        </Notice>
      )}
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      {fields.length === 0 && (
        <p className="text-sm text-ink-muted">
          No eligibility questions: everyone who signs in may continue to consent.
        </p>
      )}
      {fields.map((field, index) => {
        const row = rows[index];
        const rowErrors = errors.questions?.[index];
        const options = row?.kind === 'choice' ? parseLines(row.options) : [];
        return (
          <fieldset key={field.id} className="rounded-md border border-line bg-canvas p-3">
            <legend className="px-1 text-sm font-semibold">Question {index + 1}</legend>
            <div className="grid gap-3 sm:grid-cols-2">
              <TextField
                label="Question"
                autoComplete="off"
                error={rowErrors?.label?.message}
                className="sm:col-span-2"
                {...register(`questions.${index}.label`)}
              />
              <TextField
                label="Key"
                autoComplete="off"
                hint="Short name, e.g. adult."
                error={rowErrors?.key?.message}
                {...register(`questions.${index}.key`)}
              />
              <Controller
                control={control}
                name={`questions.${index}.kind`}
                render={({ field: kindField }) => (
                  <SelectField
                    label="Answer"
                    value={kindField.value}
                    onChange={kindField.onChange}
                    onBlur={kindField.onBlur}
                    buttonRef={kindField.ref}
                    options={kindOptions}
                  />
                )}
              />
              {row?.kind === 'yes-no' && (
                <Controller
                  control={control}
                  name={`questions.${index}.eligibleAnswer`}
                  render={({ field: ruleField }) => (
                    <SelectField
                      label="Who may take part"
                      value={ruleField.value}
                      onChange={ruleField.onChange}
                      onBlur={ruleField.onBlur}
                      buttonRef={ruleField.ref}
                      options={yesNoRuleOptions}
                      className="sm:col-span-2"
                    />
                  )}
                />
              )}
              {row?.kind === 'number' && (
                <>
                  <TextField
                    label="Lowest possible answer"
                    inputMode="decimal"
                    error={rowErrors?.minValue?.message}
                    {...register(`questions.${index}.minValue`)}
                  />
                  <TextField
                    label="Highest possible answer"
                    inputMode="decimal"
                    error={rowErrors?.maxValue?.message}
                    {...register(`questions.${index}.maxValue`)}
                  />
                  <TextField
                    label="Eligible from"
                    inputMode="decimal"
                    hint="Empty: no lower limit."
                    error={rowErrors?.eligibleMin?.message}
                    {...register(`questions.${index}.eligibleMin`)}
                  />
                  <TextField
                    label="Eligible up to"
                    inputMode="decimal"
                    hint="Empty: no upper limit."
                    error={rowErrors?.eligibleMax?.message}
                    {...register(`questions.${index}.eligibleMax`)}
                  />
                </>
              )}
              {row?.kind === 'choice' && (
                <>
                  <TextAreaField
                    label="Options"
                    hint="One per line."
                    error={rowErrors?.options?.message}
                    {...register(`questions.${index}.options`)}
                  />
                  <Controller
                    control={control}
                    name={`questions.${index}.eligibleOptions`}
                    render={({ field: eligibleField }) => (
                      <fieldset className="flex flex-col gap-1.5">
                        <legend className="mb-1 text-xs font-semibold">Options that may take part</legend>
                        {options.length === 0 && <p className="text-xs text-ink-faint">List the options first.</p>}
                        {options.map((option) => (
                          <CheckboxField
                            key={option}
                            label={option}
                            checked={eligibleField.value.includes(option)}
                            onChange={(checked) =>
                              eligibleField.onChange(
                                checked
                                  ? [...eligibleField.value, option]
                                  : eligibleField.value.filter((value) => value !== option),
                              )
                            }
                          />
                        ))}
                        {options.length > 0 && (
                          <p className="text-xs text-ink-faint">None ticked: every option may take part.</p>
                        )}
                      </fieldset>
                    )}
                  />
                </>
              )}
              <TextField
                label="Rule in plain words"
                autoComplete="off"
                hint="Shown on the study page, e.g. “18 or older”."
                error={rowErrors?.criterion?.message}
                {...register(`questions.${index}.criterion`)}
              />
              <TextField
                label="Help text"
                autoComplete="off"
                hint="Optional, shown under the question."
                error={rowErrors?.help?.message}
                {...register(`questions.${index}.help`)}
              />
            </div>
            <div className="mt-3 flex justify-end">
              <Button
                variant="quiet"
                size="compact"
                onClick={() => remove(index)}
                aria-label={`Remove question ${index + 1}`}
              >
                Remove
              </Button>
            </div>
          </fieldset>
        );
      })}
      <div className="flex flex-wrap items-center justify-between gap-3">
        <Button onClick={() => append({ ...emptyScreeningRow, eligibleOptions: [] })} disabled={fields.length >= 30}>
          Add question
        </Button>
        <div className="flex gap-2">
          <Button onClick={onCancel}>Cancel</Button>
          <Button type="submit" variant="primary" pending={replace.isPending}>
            Save questions
          </Button>
        </div>
      </div>
    </form>
  );
}
