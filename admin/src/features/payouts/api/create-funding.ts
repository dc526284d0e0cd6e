import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { formatMinor, parseMajorAmount } from '@/lib/money';
import { payoutKeys } from './payout-keys';

export type FundingIntent = components['schemas']['FundingIntentDto'];
export type Budget = components['schemas']['BudgetDto'];

// CreateFundingDto in api/src/payouts/dto/payout.dto.ts: 100 to 100,000,000 minor units.
export const fundingMinimumMinor = 100;
export const fundingMaximumMinor = 100_000_000;

/** The amount typed in major units (e.g. "250.00"), read into minor units for the api. */
export function fundingAmountSchema(currency: string) {
  return z.object({
    amount: z.string().transform((text, context) => {
      const parsed = parseMajorAmount(text, currency);
      if (!parsed.ok) {
        context.addIssue({ code: 'custom', message: parsed.message });
        return z.NEVER;
      }
      if (parsed.minor < fundingMinimumMinor) {
        context.addIssue({
          code: 'custom',
          message: `Add at least ${formatMinor(fundingMinimumMinor, currency, 'en-US')}.`,
        });
        return z.NEVER;
      }
      if (parsed.minor > fundingMaximumMinor) {
        context.addIssue({
          code: 'custom',
          message: `Add at most ${formatMinor(fundingMaximumMinor, currency, 'en-US')} at a time.`,
        });
        return z.NEVER;
      }
      return parsed.minor;
    }),
  });
}
export type FundingAmountInput = z.input<ReturnType<typeof fundingAmountSchema>>;
export type FundingAmountOutput = z.output<ReturnType<typeof fundingAmountSchema>>;

/** Opens a card payment with the provider; the card is confirmed in the browser with the returned client secret. */
export async function createFunding(studyId: string, amountMinor: number): Promise<FundingIntent> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/funding', { params: { path: { studyId } }, body: { amountMinor } }),
  );
}

/** Asks the api to read the confirmed payment from the provider now, instead of waiting for its webhook. */
export async function refreshFunding(studyId: string, fundingId: string): Promise<Budget> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/funding/{fundingId}/refresh', { params: { path: { studyId, fundingId } } }),
  );
}

export function useCreateFunding(studyId: string) {
  return useMutation({ mutationFn: (amountMinor: number) => createFunding(studyId, amountMinor) });
}

export function useRefreshFunding(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (fundingId: string) => refreshFunding(studyId, fundingId),
    onSuccess: (budget) => {
      queryClient.setQueryData(payoutKeys.budget(studyId), budget);
      return queryClient.invalidateQueries({ queryKey: payoutKeys.all(studyId) });
    },
  });
}
