import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useRef } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-problem';
import { describeProblem, plainFieldMessage } from '@/lib/problem-message';
import type { ConsentToSign } from '../api/get-consent';
import {
  type CurrentConsentVersion,
  currentVersionAfterConflict,
  type Signature,
  signatureFormSchema,
  type SignatureFormValues,
  signatureRequest,
  useSignConsent,
} from '../api/sign-consent';
import { ConsentCaution } from './consent-caution';
import { SignaturePadField } from './signature-pad-field';
import { VersionFingerprint } from './version-fingerprint';

type SignatureStepProps = {
  studyId: string;
  consent: ConsentToSign;
  onSigned: (signature: Signature) => void;
  /** The api refused because a newer version of the form is active now. */
  onVersionChanged: (current: CurrentConsentVersion) => void;
  onBack: () => void;
};

/** Typed full name, an optional drawn mark, and the meaning of signing stated right beside the button. */
export function SignatureStep({ studyId, consent, onSigned, onVersionChanged, onBack }: SignatureStepProps) {
  const sign = useSignConsent();
  const headingRef = useRef<HTMLHeadingElement>(null);
  const { control, handleSubmit, setError, formState } = useForm<SignatureFormValues>({
    resolver: zodResolver(signatureFormSchema),
    mode: 'onTouched',
    defaultValues: { typedName: '', mark: '' },
  });

  useEffect(() => headingRef.current?.focus(), []);

  const submit = handleSubmit(async (values) => {
    try {
      onSigned(await sign.mutateAsync({ studyId, body: signatureRequest(values, consent) }));
    } catch (error) {
      const current = currentVersionAfterConflict(error);
      if (current) {
        onVersionChanged(current);
        return;
      }
      const fieldErrors = isApiError(error, 'VALIDATION_FAILED') ? error.fieldErrors : [];
      const nameProblem = fieldErrors.find((fieldError) => fieldError.field === 'typedName');
      const markProblem = fieldErrors.find((fieldError) => fieldError.field === 'mark');
      if (nameProblem) {
        setError(
          'typedName',
          { message: plainFieldMessage(nameProblem, 'Please type your full name, 2 to 200 characters.') },
          { shouldFocus: true },
        );
      }
      if (markProblem) {
        setError('mark', {
          message: plainFieldMessage(
            markProblem,
            'Your drawing could not be saved. Please clear it and draw it again, or leave it out.',
          ),
        });
      }
      if (!nameProblem && !markProblem) setError('root.server', { message: signingProblem(error) });
    }
  });

  const serverProblem = formState.errors.root?.server?.message;

  return (
    <form noValidate onSubmit={submit} aria-labelledby="signature-heading" className="flex flex-col gap-6">
      <div className="flex flex-col gap-2">
        <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">Last step</p>
        <h2 id="signature-heading" ref={headingRef} tabIndex={-1} className="text-heading font-bold focus:outline-none">
          Sign the consent form
        </h2>
        <p>You are signing this version of the form:</p>
      </div>
      <VersionFingerprint version={consent.version} fingerprint={consent.fingerprint} approval={consent.approval} />

      <Controller
        name="typedName"
        control={control}
        render={({ field, fieldState }) => (
          <TextField
            {...field}
            label="Your full name"
            hint="Type your first and last name. This is your signature."
            autoComplete="name"
            autoCapitalize="words"
            spellCheck={false}
            error={fieldState.error?.message}
          />
        )}
      />

      <Controller
        name="mark"
        control={control}
        render={({ field, fieldState }) => (
          <SignaturePadField
            onChange={field.onChange}
            error={fieldState.error?.message}
            disabled={formState.isSubmitting}
          />
        )}
      />

      {serverProblem ? (
        <Notice tone="error" title="Your signature was not saved">
          {serverProblem}
        </Notice>
      ) : null}

      <div className="flex flex-col gap-3 rounded-card border-2 border-clay bg-clay-tint/50 p-4">
        <p id="signature-meaning">
          By tapping the button you sign electronically, and your signature means:{' '}
          <strong className="font-bold">“{consent.signatureMeaning}”</strong>
        </p>
        <Button type="submit" wide disabled={formState.isSubmitting} aria-describedby="signature-meaning">
          {formState.isSubmitting ? 'Signing…' : 'Sign the form'}
        </Button>
        <p className="text-fine text-ink-soft">
          We save your name with the date and time, and e-mail you a signed copy.
        </p>
      </div>

      <Button variant="secondary" wide onClick={onBack} disabled={formState.isSubmitting}>
        Back to the form
      </Button>
      <ConsentCaution />
    </form>
  );
}

function signingProblem(error: unknown): string {
  if (isApiError(error, 'PARTICIPATION_STATE') || isApiError(error, 'NO_CONSENT_TO_SIGN')) {
    return 'The study is not ready for your signature yet. Please go back to the study page and answer the questions first.';
  }
  return describeProblem(error);
}
