import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { ApiError, toApiProblem } from '@/lib/api-error';
import { rosterKey } from './get-roster';

/** One problem in the CSV: the 1-based line (1 is the header row), the column and what is wrong. */
export interface ImportRowError {
  line: number;
  field: string;
  message: string;
}

// The OpenAPI schema marks the error items' properties optional; ImportResultDto always sends all three.
export type ImportResult = Omit<components['schemas']['ImportResultDto'], 'errors'> & { errors: ImportRowError[] };

export interface ImportProgress {
  stage: 'reading' | 'uploading' | 'checking';
  loaded: number;
  total: number;
}

const origin = globalThis.location?.origin ?? 'http://localhost';

function readFile(file: File, onProgress: (progress: ImportProgress) => void): Promise<ArrayBuffer> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onprogress = (event) =>
      onProgress({ stage: 'reading', loaded: event.loaded, total: event.lengthComputable ? event.total : file.size });
    reader.onload = () => resolve(reader.result as ArrayBuffer);
    reader.onerror = () =>
      reject(
        new ApiError({
          statusCode: 0,
          code: 'FILE_UNREADABLE',
          message: `The file ${file.name} could not be read. Choose it again.`,
        }),
      );
    reader.readAsArrayBuffer(file);
  });
}

function post(
  studyId: string,
  csv: Blob,
  fileName: string,
  onProgress: (progress: ImportProgress) => void,
): Promise<{ status: number; text: string }> {
  return new Promise((resolve, reject) => {
    // XMLHttpRequest rather than fetch: only it reports upload progress.
    const request = new XMLHttpRequest();
    request.open('POST', `${origin}/api/studies/${encodeURIComponent(studyId)}/enrollments/import`);
    request.withCredentials = true;
    request.upload.onprogress = (event) =>
      onProgress({ stage: 'uploading', loaded: event.loaded, total: event.lengthComputable ? event.total : csv.size });
    request.upload.onload = () => onProgress({ stage: 'checking', loaded: csv.size, total: csv.size });
    request.onload = () => resolve({ status: request.status, text: request.responseText });
    request.onerror = () =>
      reject(
        new ApiError({
          statusCode: 0,
          code: 'NETWORK',
          message: 'Could not reach the Evenhand server. Check your connection and try again.',
        }),
      );
    const form = new FormData();
    form.append('file', csv, fileName);
    request.send(form);
  });
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/** Reads the CSV, uploads it with progress and resolves to the api's row-by-row report. */
export async function importRoster(
  studyId: string,
  file: File,
  onProgress: (progress: ImportProgress) => void,
): Promise<ImportResult> {
  const bytes = await readFile(file, onProgress);
  const csv = new Blob([bytes], { type: 'text/csv' });
  let answer = await post(studyId, csv, file.name, onProgress);
  if (answer.status === 401) {
    // The access cookie expired: one call through the shared client renews the session (one refresh for the whole app), then retry.
    const renewed = await apiClient.GET('/api/auth/me').then(
      (result) => result.response.ok,
      () => false,
    );
    if (renewed) answer = await post(studyId, csv, file.name, onProgress);
  }
  const body = parseJson(answer.text);
  if (answer.status < 200 || answer.status >= 300) throw new ApiError(toApiProblem(answer.status, body));
  return body as ImportResult;
}

export function useImportRoster(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ file, onProgress }: { file: File; onProgress: (progress: ImportProgress) => void }) =>
      importRoster(studyId, file, onProgress),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
