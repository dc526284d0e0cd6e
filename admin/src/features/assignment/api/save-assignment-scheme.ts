import type { AssignmentSchemeRequest } from '@evenhand/contract';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import { z } from 'zod';
import {
  betweenMethods,
  checkSchemeSettings,
  withinMethods,
  type SchemeContext,
  type SchemeFormValues,
  type SchemeMethod,
  type SchemeSettings,
} from '../utils/scheme-settings';
import type { Assignment } from './get-assignment';

/** The scheme's form fields; the dry-run form reuses them to compare another scheme. */
export const schemeFormFields = {
  method: z.enum([...betweenMethods, ...withinMethods] as [SchemeMethod, ...SchemeMethod[]]).optional(),
  blockSizes: z.string(),
  measure: z.enum(['range', 'variance']),
  coinProbability: z.string(),
  pretestKey: z.string(),
  squaresPerBlock: z.string(),
  stratify: z.boolean(),
};

/** The scheme form's schema: the settings are checked against the current conditions and factors. */
export function schemeFormSchema(context: SchemeContext) {
  return z.object(schemeFormFields).superRefine((values, ctx) => {
    for (const issue of checkSchemeSettings(values, context))
      ctx.addIssue({ code: 'custom', path: [issue.path], message: issue.message });
  });
}

/** Where the api's field errors for a scheme land on the form; conditions and factors have no input here. */
export function schemeFieldOf(apiField: string): keyof SchemeFormValues | null {
  const first = apiField.split('.')[0] ?? apiField;
  if (first === 'pretestId' || first === 'pretestKey') return 'pretestKey';
  return (
    (['method', 'blockSizes', 'measure', 'coinProbability', 'squaresPerBlock', 'stratify'] as const).find(
      (field) => field === first,
    ) ?? null
  );
}

export async function saveAssignmentScheme(
  studyId: string,
  method: SchemeMethod,
  settings: SchemeSettings,
): Promise<Assignment> {
  return unwrap(
    apiClient.PUT('/api/studies/{studyId}/assignment-scheme', {
      params: { path: { studyId } },
      // The form's settings hold only the chosen method's fields (toSchemeSettings), as the contract's union requires.
      body: { method, ...settings } as AssignmentSchemeRequest,
    }),
  );
}

export function useSaveAssignmentScheme(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ method, settings }: { method: SchemeMethod; settings: SchemeSettings }) =>
      saveAssignmentScheme(studyId, method, settings),
    onSuccess: (assignment) => {
      queryClient.setQueryData(studyKeys.assignment(studyId), assignment);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.assignment(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(studyId) }),
      ]);
    },
  });
}
