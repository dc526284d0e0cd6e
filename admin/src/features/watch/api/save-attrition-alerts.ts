import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { parseMajorAmount } from '@/lib/money';
import type { AttritionAlerts } from './get-attrition-alerts';
import { watchKeys } from './watch-keys';

export type AttritionAlertsInput = components['schemas']['PutAttritionAlertsDto'];

/** The form's values: the pay amount is typed in major units and turned into minor units on submit. Limits as the api's DTO. */
export const alertThresholdsSchema = (currency: string) =>
  z.object({
    differentialEnabled: z.boolean(),
    logRankEnabled: z.boolean(),
    pValueBelow: z
      .string()
      .trim()
      .min(1, 'Enter a p-value threshold.')
      .refine((text) => /^(0?\.\d+|0|1)$/.test(text), 'Enter the p-value as a decimal, like 0.05.')
      .refine(
        (text) => Number(text) >= 0.0001 && Number(text) <= 0.5,
        'The p-value threshold must be between 0.0001 and 0.5.',
      ),
    payEnabled: z.boolean(),
    payAmount: z.string().superRefine((text, context) => {
      const parsed = parseMajorAmount(text, currency);
      if (!parsed.ok) context.addIssue({ code: 'custom', message: parsed.message });
    }),
    payBasis: z.enum(['paid', 'earned']),
  });

export type AlertThresholdsValues = z.infer<ReturnType<typeof alertThresholdsSchema>>;

export function toAlertsInput(
  values: AlertThresholdsValues,
  currency: string,
  comparisonConditionId: string | null,
): AttritionAlertsInput {
  const amount = parseMajorAmount(values.payAmount, currency);
  if (!amount.ok) throw new Error(`payAmount: ${amount.message}`);
  return {
    differentialAttrition: { enabled: values.differentialEnabled, comparisonConditionId },
    logRank: { enabled: values.logRankEnabled, pValueBelow: Number(values.pValueBelow) },
    payDifference: { enabled: values.payEnabled, amountMinor: amount.minor, basis: values.payBasis },
  };
}

export async function saveAttritionAlerts(studyId: string, body: AttritionAlertsInput): Promise<AttritionAlerts> {
  return unwrap(apiClient.PUT('/api/studies/{studyId}/attrition/alerts', { params: { path: { studyId } }, body }));
}

export function useSaveAttritionAlerts(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: AttritionAlertsInput) => saveAttritionAlerts(studyId, body),
    onSuccess: (alerts) => queryClient.setQueryData(watchKeys.alerts(studyId), alerts),
  });
}
