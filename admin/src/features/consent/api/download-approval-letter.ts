import { useMutation } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { saveBlob } from '@/lib/save-blob';

export async function downloadApprovalLetter(studyId: string, versionId: string, fileName: string): Promise<void> {
  const letter = await unwrap(
    apiClient.GET('/api/studies/{studyId}/consent-versions/{versionId}/approval-letter', {
      params: { path: { studyId, versionId } },
      parseAs: 'blob',
    }),
  );
  saveBlob(letter as Blob, fileName);
}

/** Fetches the letter through the session-aware client (so an expired access cookie is renewed), then saves it. */
export function useDownloadApprovalLetter(studyId: string, versionId: string) {
  return useMutation({ mutationFn: (fileName: string) => downloadApprovalLetter(studyId, versionId, fileName) });
}
