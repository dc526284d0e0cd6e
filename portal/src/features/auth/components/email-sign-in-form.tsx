import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-problem';
import { describeProblem, plainFieldMessage } from '@/lib/problem-message';
import { signInLinkFormSchema, useRequestSignInLink, type SignInLinkFormValues } from '../api/request-sign-in-link';

type EmailSignInFormProps = {
  /** From a study link (`?study=`), so the api can connect the new sign-in to that study. */
  studySlug?: string | undefined;
  defaultEmail?: string;
  onSent: (email: string) => void;
};

export function EmailSignInForm({ studySlug, defaultEmail = '', onSent }: EmailSignInFormProps) {
  const requestLink = useRequestSignInLink();
  const { control, handleSubmit, setError, formState } = useForm({
    // Each field is checked as soon as the person leaves it, then again as they correct it.
    mode: 'onTouched',
    resolver: zodResolver(signInLinkFormSchema),
    defaultValues: { email: defaultEmail } satisfies SignInLinkFormValues,
  });

  const submit = handleSubmit(async ({ email }) => {
    try {
      await requestLink.mutateAsync(studySlug ? { email, studySlug } : { email });
      onSent(email);
    } catch (error) {
      const emailProblem = isApiError(error, 'VALIDATION_FAILED')
        ? error.fieldErrors.find((fieldError) => fieldError.field === 'email')
        : undefined;
      if (emailProblem) {
        setError(
          'email',
          {
            message: plainFieldMessage(emailProblem, 'Please enter your whole e-mail address, like name@example.com.'),
          },
          { shouldFocus: true },
        );
      } else setError('root.server', { message: describeProblem(error) });
    }
  });

  const serverProblem = formState.errors.root?.server?.message;

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-6" aria-label="Sign in with your e-mail">
      <Controller
        name="email"
        control={control}
        render={({ field, fieldState }) => (
          <TextField
            {...field}
            label="Your e-mail address"
            hint="We will send a sign-in link to this address."
            type="email"
            inputMode="email"
            autoComplete="email"
            autoCapitalize="none"
            spellCheck={false}
            placeholder="name@example.com"
            error={fieldState.error?.message}
          />
        )}
      />
      {serverProblem ? (
        <Notice tone="error" title="We could not send your link">
          {serverProblem}
        </Notice>
      ) : null}
      <Button type="submit" wide disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Sending your link…' : 'Send me a sign-in link'}
      </Button>
    </form>
  );
}
