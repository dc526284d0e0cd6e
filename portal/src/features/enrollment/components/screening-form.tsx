import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { RadioChoice } from '@/components/ui/radio-choice';
import { SelectList } from '@/components/ui/select-list';
import { TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-problem';
import { describeProblem, plainFieldMessage } from '@/lib/problem-message';
import type { ScreeningQuestion } from '../api/get-my-enrollment';
import {
  answerProblemInWords,
  numberRangeHint,
  screeningDefaultValues,
  screeningFieldForApiField,
  screeningFieldName,
  screeningFormSchema,
  type ScreeningAnswer,
  type ScreeningFormValues,
} from '../api/screening-schema';
import { type ScreeningResult, useSubmitScreening } from '../api/submit-screening';

type ScreeningFormProps = {
  studyId: string;
  questions: ScreeningQuestion[];
  answers: Record<string, unknown> | null;
  onScreened?: (result: ScreeningResult) => void;
};

/** Up to this many answers show as radio buttons; more open as a list. */
const MAX_RADIO_OPTIONS = 6;

const yesNo = [
  { value: 'yes', label: 'Yes' },
  { value: 'no', label: 'No' },
];

/** The study's screening questions as a form, built from their definitions; the api decides who is eligible. */
export function ScreeningForm({ studyId, questions, answers, onScreened }: ScreeningFormProps) {
  const submitScreening = useSubmitScreening();
  const schema = useMemo(() => screeningFormSchema(questions), [questions]);
  const { control, handleSubmit, setError, formState } = useForm<
    ScreeningFormValues,
    unknown,
    { answers: Record<string, ScreeningAnswer> }
  >({
    resolver: zodResolver(schema),
    // Each answer is checked as soon as the person leaves it, then again as they correct it.
    mode: 'onTouched',
    defaultValues: screeningDefaultValues(questions, answers),
  });

  const submit = handleSubmit(async (body) => {
    try {
      const result = await submitScreening.mutateAsync({ studyId, body });
      onScreened?.(result);
    } catch (error) {
      const fieldErrors = isApiError(error, 'VALIDATION_FAILED') ? error.fieldErrors : [];
      let placed = false;
      for (const fieldError of fieldErrors) {
        const name = screeningFieldForApiField(questions, fieldError.field);
        const question = questions.find((candidate) => `answers.${candidate.key}` === fieldError.field);
        if (!name || !question) continue;
        setError(
          name,
          { message: plainFieldMessage(fieldError, answerProblemInWords(question)) },
          { shouldFocus: !placed },
        );
        placed = true;
      }
      if (!placed) setError('root.server', { message: describeProblem(error) });
    }
  });

  if (questions.length === 0) {
    return (
      <section className="flex flex-col gap-4">
        <p>This study has no questions for you to answer. Tap continue to go on to the consent form.</p>
        <form noValidate onSubmit={submit}>
          <Button type="submit" wide disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Saving…' : 'Continue'}
          </Button>
        </form>
      </section>
    );
  }

  const serverProblem = formState.errors.root?.server?.message;

  return (
    <form noValidate onSubmit={submit} aria-labelledby="screening-heading" className="flex flex-col gap-7">
      <div className="flex flex-col gap-2">
        <h2 id="screening-heading" className="text-heading font-bold">
          A few questions first
        </h2>
        <p>
          These tell us whether this study is a good fit for you. There are no right or wrong answers, and only the
          research team sees them.
        </p>
      </div>

      {questions.map((question, index) => (
        <Controller
          key={question.key}
          name={screeningFieldName(index)}
          control={control}
          render={({ field, fieldState }) => {
            const error = fieldState.error?.message;
            if (question.kind === 'yes-no') {
              return (
                <RadioChoice
                  ref={field.ref}
                  label={question.label}
                  hint={question.help}
                  error={error}
                  options={yesNo}
                  value={field.value}
                  onChange={field.onChange}
                  onBlur={field.onBlur}
                />
              );
            }
            if (question.kind === 'choice') {
              const options = question.options ?? [];
              return options.length <= MAX_RADIO_OPTIONS ? (
                <RadioChoice
                  ref={field.ref}
                  label={question.label}
                  hint={question.help}
                  error={error}
                  options={options.map((option) => ({ value: option, label: option }))}
                  value={field.value}
                  onChange={field.onChange}
                  onBlur={field.onBlur}
                />
              ) : (
                <SelectList
                  ref={field.ref}
                  label={question.label}
                  hint={question.help}
                  error={error}
                  options={options}
                  value={field.value}
                  onChange={field.onChange}
                  onBlur={field.onBlur}
                />
              );
            }
            const hint = [question.help, numberRangeHint(question)].filter(Boolean).join(' · ');
            return (
              <TextField
                {...field}
                label={question.label}
                hint={hint || undefined}
                error={error}
                type="number"
                inputMode="decimal"
                step="any"
                min={question.min ?? undefined}
                max={question.max ?? undefined}
                autoComplete="off"
              />
            );
          }}
        />
      ))}

      {serverProblem ? (
        <Notice tone="error" title="We could not save your answers">
          {serverProblem}
        </Notice>
      ) : null}
      <Button type="submit" wide disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Saving your answers…' : 'Save my answers'}
      </Button>
    </form>
  );
}
