import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { ReminderPlan } from './get-reminder-plan';

export type SaveReminderPlanBody = components['schemas']['SaveReminderPlanDto'];

const wholeNumber = (text: string) => /^\d+$/.test(text.trim());

// Limits as SaveReminderPlanDto in api/src/reminders/dto/reminders.dto.ts.
export const reminderPlanInputSchema = z
  .object({
    enabled: z.boolean(),
    rules: z
      .array(
        z.object({
          anchor: z.enum(['opens', 'due']),
          days: z
            .string()
            .trim()
            .refine((text) => wholeNumber(text) && Number(text) <= 60, 'Enter a whole number of days from 0 to 60.'),
        }),
      )
      .max(10, 'A plan can have at most 10 reminders per step.'),
    suggestLostAfter: z
      .string()
      .trim()
      .refine(
        (text) => wholeNumber(text) && Number(text) >= 1 && Number(text) <= 50,
        'Enter a whole number of reminders from 1 to 50.',
      ),
  })
  .superRefine((values, ctx) => {
    const seen = new Set<string>();
    values.rules.forEach((rule, index) => {
      const key = `${rule.anchor}:${Number(rule.days)}`;
      if (seen.has(key))
        ctx.addIssue({
          code: 'custom',
          path: ['rules', index, 'days'],
          message: 'This reminder is already in the plan.',
        });
      seen.add(key);
    });
  })
  .transform((values): SaveReminderPlanBody => ({
    enabled: values.enabled,
    rules: values.rules.map((rule) => ({ anchor: rule.anchor, days: Number(rule.days) })),
    suggestLostAfter: Number(values.suggestLostAfter),
  }));

export type ReminderPlanFormValues = z.input<typeof reminderPlanInputSchema>;

export async function saveReminderPlan(studyId: string, body: SaveReminderPlanBody): Promise<ReminderPlan> {
  return unwrap(apiClient.PUT('/api/studies/{studyId}/reminder-plan', { params: { path: { studyId } }, body }));
}

/** The plan decides who the roster suggests marking lost, so the roster is refreshed too. */
export function useSaveReminderPlan(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SaveReminderPlanBody) => saveReminderPlan(studyId, body),
    onSuccess: (plan) => {
      queryClient.setQueryData(studyKeys.reminderPlan(studyId), plan);
      return queryClient.invalidateQueries({
        queryKey: studyKeys.detail(studyId),
        predicate: (query) => query.queryKey[2] === 'roster',
      });
    },
  });
}
