import { useMutation } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { saveBlob } from '@/lib/save-blob';

export interface SignedCopyRequest {
  enrollmentId: string;
  signatureId: string;
  fileName: string;
}

export async function downloadSignedCopy(
  studyId: string,
  { enrollmentId, signatureId, fileName }: SignedCopyRequest,
): Promise<void> {
  const pdf = await unwrap(
    apiClient.GET('/api/studies/{studyId}/enrollments/{enrollmentId}/signatures/{signatureId}/pdf', {
      params: { path: { studyId, enrollmentId, signatureId } },
      parseAs: 'blob',
    }),
  );
  saveBlob(pdf as Blob, fileName);
}

/** Fetches the signed PDF through the session-aware client (an expired access cookie is renewed), then saves it. */
export function useDownloadSignedCopy(studyId: string) {
  return useMutation({ mutationFn: (request: SignedCopyRequest) => downloadSignedCopy(studyId, request) });
}
