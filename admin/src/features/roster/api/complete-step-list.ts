import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { parseReferenceList } from '../utils/reference-list';
import { rosterKey } from './get-roster';

export type BulkCompletionResult = components['schemas']['BulkCompletionResultDto'];
export type BulkCompletionRow = components['schemas']['BulkCompletionRowDto'];

/** The api takes at most 5,000 references in one list (BulkCompletionDto). */
export const maxListedReferences = 5000;

export const stepListInputSchema = z
  .object({
    // Checked below with the list, so both problems show at once.
    stepId: z.string().optional(),
    references: z.string(),
  })
  .superRefine((values, ctx) => {
    if (!values.stepId) ctx.addIssue({ code: 'custom', path: ['stepId'], message: 'Choose the step to mark done.' });
    const references = parseReferenceList(values.references);
    if (references.length === 0)
      ctx.addIssue({
        code: 'custom',
        path: ['references'],
        message: 'Paste at least one participant reference, one per line.',
      });
    if (references.length > maxListedReferences) {
      ctx.addIssue({
        code: 'custom',
        path: ['references'],
        message: `A list can have at most ${maxListedReferences.toLocaleString()} references; split it.`,
      });
    }
    if (references.some((reference) => reference.length > 200)) {
      ctx.addIssue({
        code: 'custom',
        path: ['references'],
        message: 'A line is longer than 200 characters; put one reference on each line.',
      });
    }
  })
  .transform((values) => ({ stepId: values.stepId ?? '', references: parseReferenceList(values.references) }));

export type StepListFormValues = z.input<typeof stepListInputSchema>;
export type StepListInput = z.output<typeof stepListInputSchema>;

export async function completeStepList(
  studyId: string,
  { stepId, references }: StepListInput,
): Promise<BulkCompletionResult> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/steps/{stepId}/completions', {
      params: { path: { studyId, stepId } },
      body: { references },
    }),
  );
}

export function useCompleteStepList(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: StepListInput) => completeStepList(studyId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
