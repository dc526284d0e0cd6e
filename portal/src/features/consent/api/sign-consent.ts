import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { isApiError, toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';

type SignatureOperation = paths['/api/studies/{studyId}/enrollments/me/signature']['post'];
export type SignatureRequest = SignatureOperation['requestBody']['content']['application/json'];
export type Signature = SignatureOperation['responses'][201]['content']['application/json'];

/** The api takes a drawn mark of up to 200 KB; a PNG data URL is base64 text, so its length bounds the bytes. */
export const MARK_MAX_CHARACTERS = 200 * 1024;

export const signatureFormSchema = z.object({
  typedName: z
    .string()
    .trim()
    .min(1, 'Please type your full name.')
    .min(2, 'Please type your full name, at least 2 letters.')
    .max(200, 'Please keep your name to 200 characters or fewer.'),
  mark: z
    .string()
    .max(
      MARK_MAX_CHARACTERS,
      'Your drawing is too detailed to save. Please clear it and draw a simpler one, or leave it out.',
    )
    .refine(
      (mark) => mark === '' || mark.startsWith('data:image/png;base64,'),
      'Your drawing could not be read. Please clear it and try again.',
    ),
});

export type SignatureFormValues = z.input<typeof signatureFormSchema>;

/** The signer's own IANA time zone, so the signed copy states the signing time as they lived it. */
export function signerTimeZone(): string | undefined {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || undefined;
}

/** What the signature form and the form's version make together; an empty drawing is left out. */
export function signatureRequest(
  form: z.output<typeof signatureFormSchema>,
  version: { versionId: string; fingerprint: string },
  timeZone: string | undefined = signerTimeZone(),
): SignatureRequest {
  return {
    versionId: version.versionId,
    fingerprint: version.fingerprint,
    typedName: form.typedName,
    ...(form.mark === '' ? {} : { mark: form.mark }),
    ...(timeZone ? { timeZone } : {}),
  };
}

export async function signConsent({ studyId, body }: { studyId: string; body: SignatureRequest }): Promise<Signature> {
  const { data, error, response } = await api.POST('/api/studies/{studyId}/enrollments/me/signature', {
    params: { path: { studyId } },
    body,
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export type CurrentConsentVersion = { versionId: string; version: number; fingerprint: string };

/** When a signature was refused because the form changed, the version that is current now. */
export function currentVersionAfterConflict(error: unknown): CurrentConsentVersion | null {
  if (!isApiError(error, 'CONSENT_VERSION_STALE')) return null;
  const current = error.problem.currentVersion as Partial<CurrentConsentVersion> | undefined;
  if (!current || typeof current.versionId !== 'string' || typeof current.version !== 'number') return null;
  return { versionId: current.versionId, version: current.version, fingerprint: String(current.fingerprint ?? '') };
}

export function useSignConsent() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signConsent,
    onSuccess: (signature, { studyId }) => {
      // Signing moves the enrollment on (assigned, steps open); the answer carries it whole.
      queryClient.setQueryData(queryKeys.myEnrollment(studyId), signature.enrollment);
      void queryClient.invalidateQueries({ queryKey: queryKeys.myStudies });
    },
    onError: (error, { studyId }) => {
      // The form changed under the reader: fetch the new version so they can read it.
      if (currentVersionAfterConflict(error))
        void queryClient.invalidateQueries({ queryKey: queryKeys.myEnrollmentAll(studyId) });
    },
  });
}
