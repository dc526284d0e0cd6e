import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { consentVersionKey } from './get-consent-version';
import { consentVersionsKey, type ConsentVersion } from './get-consent-versions';

export async function uploadApprovalLetter(studyId: string, versionId: string, letter: File): Promise<ConsentVersion> {
  const updated = await unwrap(
    apiClient.POST('/api/studies/{studyId}/consent-versions/{versionId}/approval-letter', {
      params: { path: { studyId, versionId } },
      // The generated type calls the file a string (OpenAPI "binary"); the serializer sends it as multipart.
      body: { letter: letter as unknown as string },
      bodySerializer: () => {
        const form = new FormData();
        form.append('letter', letter, letter.name);
        return form;
      },
    }),
  );
  return updated as ConsentVersion;
}

export function useUploadApprovalLetter(studyId: string, versionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (letter: File) => uploadApprovalLetter(studyId, versionId, letter),
    onSuccess: (version) => {
      queryClient.setQueryData(consentVersionKey(studyId, versionId), version);
      return queryClient.invalidateQueries({ queryKey: consentVersionsKey(studyId), exact: true });
    },
  });
}
