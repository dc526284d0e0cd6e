import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-problem';
import { describeProblem, plainFieldMessage } from '@/lib/problem-message';
import {
  type CompleteStepRequest,
  completionCodeFormSchema,
  type CompletionCodeFormValues,
  needsReconsent,
  useCompleteStep,
} from '../api/complete-step';
import type { MyEnrollment } from '../api/get-my-enrollment';

type StepCompletionFormProps = {
  studyId: string;
  stepId: string;
  /** The step's heading, which names the form for screen readers. */
  labelledBy: string;
  contactEmail?: string | null | undefined;
  onCompleted: (enrollment: MyEnrollment) => void;
  /** The consent form changed: the person is taken to sign the new one first. */
  onNeedsReconsent?: () => void;
  /** Secondary when the step's task is the main way to finish it and the code only the fallback. */
  fallback?: boolean;
};

type RootProblem = 'rate-limited' | 'other';

/** "I finished this step": the participant types the code shown at the end of the step's task. */
export function StepCompletionForm({
  studyId,
  stepId,
  labelledBy,
  contactEmail,
  onCompleted,
  onNeedsReconsent,
  fallback = false,
}: StepCompletionFormProps) {
  const completeStep = useCompleteStep();
  const { control, handleSubmit, setError, formState } = useForm<
    CompletionCodeFormValues,
    unknown,
    CompleteStepRequest
  >({
    resolver: zodResolver(completionCodeFormSchema),
    mode: 'onTouched',
    defaultValues: { code: '' },
  });

  const submit = handleSubmit(async (body) => {
    try {
      onCompleted(await completeStep.mutateAsync({ studyId, stepId, body }));
    } catch (error) {
      if (needsReconsent(error)) {
        onNeedsReconsent?.();
        return;
      }
      const codeProblem = isApiError(error, 'VALIDATION_FAILED')
        ? error.fieldErrors.find((fieldError) => fieldError.field === 'code')
        : undefined;
      if (codeProblem) {
        setError(
          'code',
          { message: plainFieldMessage(codeProblem, 'That code was not accepted. Please check it and try again.') },
          { shouldFocus: true },
        );
        return;
      }
      const kind: RootProblem = isApiError(error, 'RATE_LIMITED') ? 'rate-limited' : 'other';
      setError(`root.${kind}`, { message: describeProblem(error) });
    }
  });

  const rootErrors = formState.errors.root;

  return (
    <form
      noValidate
      onSubmit={submit}
      aria-labelledby={labelledBy}
      className="flex flex-col gap-3 border-t border-sand-deep pt-3"
    >
      <Controller
        name="code"
        control={control}
        render={({ field, fieldState }) => (
          <TextField
            {...field}
            label="Completion code"
            hint="Shown at the end of this step. Capital letters and spaces do not matter."
            error={fieldState.error?.message}
            autoComplete="off"
            autoCapitalize="characters"
            autoCorrect="off"
            spellCheck={false}
          />
        )}
      />
      {rootErrors?.['rate-limited'] ? (
        <Notice title="Let’s pause for a few minutes">
          A few codes did not match in a short while, so we have paused checking codes for 15 minutes. Nothing is lost:
          your step will still count. Please try again later
          {contactEmail ? (
            <>
              , or ask the research team at{' '}
              <a href={`mailto:${contactEmail}`} className="font-semibold text-clay-ink underline">
                {contactEmail}
              </a>{' '}
              to check the step off for you.
            </>
          ) : (
            ', or ask the research team to check the step off for you.'
          )}
        </Notice>
      ) : null}
      {rootErrors?.other?.message ? (
        <Notice tone="error" title="We could not check your code">
          {rootErrors.other.message}
        </Notice>
      ) : null}
      <Button type="submit" wide variant={fallback ? 'secondary' : 'primary'} disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Checking your code…' : 'I finished this step'}
      </Button>
    </form>
  );
}
