import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { StepList } from './get-steps';

export type StepSettingsBody = components['schemas']['StepSettingsDto'];

const wholeDays = (value: string) => /^\d+$/.test(value.trim()) && Number(value) <= 3650;

/**
 * How a step is verified and its window (StepSettingsDto in api/src/steps/dto/step.dto.ts). A shared code is asked for
 * only when the step has none yet; left empty, the saved code stays.
 */
export function stepSettingsInputSchema({ hasSharedCode }: { hasSharedCode: boolean }) {
  return z
    .object({
      verification: z.enum(['return-link', 'participant-code', 'shared-code', 'staff'], {
        error: 'Choose how the step is checked.',
      }),
      taskUrl: z.string().trim().max(2000, 'Keep the task address under 2,000 characters.'),
      sharedCode: z.string().trim(),
      opensAfterDays: z.string().trim(),
      opensFrom: z.enum(['assignment', 'previous-step']),
      dueMode: z.enum(['within', 'none']),
      dueWithinDays: z.string().trim(),
    })
    .superRefine((values, ctx) => {
      if (values.verification === 'return-link') {
        if (values.taskUrl === '')
          ctx.addIssue({ code: 'custom', path: ['taskUrl'], message: 'Enter the address of the external task.' });
        else if (!/^https?:\/\/[^\s/]+/i.test(values.taskUrl)) {
          ctx.addIssue({
            code: 'custom',
            path: ['taskUrl'],
            message: 'Enter a web address starting with http:// or https://.',
          });
        }
      }
      if (values.verification === 'shared-code') {
        if (values.sharedCode === '' && !hasSharedCode)
          ctx.addIssue({ code: 'custom', path: ['sharedCode'], message: 'Enter the code everyone will type.' });
        else if (values.sharedCode !== '' && (values.sharedCode.length < 4 || values.sharedCode.length > 64)) {
          ctx.addIssue({ code: 'custom', path: ['sharedCode'], message: 'The code must be 4 to 64 characters.' });
        }
      }
      if (!wholeDays(values.opensAfterDays)) {
        ctx.addIssue({
          code: 'custom',
          path: ['opensAfterDays'],
          message: 'Enter a whole number of days from 0 to 3650.',
        });
      }
      if (values.dueMode === 'within' && !wholeDays(values.dueWithinDays)) {
        ctx.addIssue({
          code: 'custom',
          path: ['dueWithinDays'],
          message: 'Enter a whole number of days from 0 to 3650, or choose no due date.',
        });
      }
    })
    .transform((values): StepSettingsBody => ({
      verification: values.verification,
      taskUrl: values.verification === 'return-link' ? values.taskUrl : null,
      opensAfterDays: Number(values.opensAfterDays),
      opensFrom: values.opensFrom,
      dueWithinDays: values.dueMode === 'within' ? Number(values.dueWithinDays) : null,
      ...(values.verification === 'shared-code' && values.sharedCode !== '' ? { sharedCode: values.sharedCode } : {}),
    }));
}

export type StepSettingsFormValues = z.input<ReturnType<typeof stepSettingsInputSchema>>;

export async function saveStepSettings(studyId: string, stepId: string, body: StepSettingsBody): Promise<StepList> {
  return unwrap(
    apiClient.PUT('/api/studies/{studyId}/steps/{stepId}', { params: { path: { studyId, stepId } }, body }),
  );
}

export function useSaveStepSettings(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ stepId, body }: { stepId: string; body: StepSettingsBody }) =>
      saveStepSettings(studyId, stepId, body),
    onSuccess: (steps) => {
      queryClient.setQueryData(studyKeys.steps(studyId), steps);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.steps(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(studyId) }),
      ]);
    },
  });
}
