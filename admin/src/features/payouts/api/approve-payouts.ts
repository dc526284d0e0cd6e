import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient } from '@/lib/api-client';
import { ApiError, toApiProblem } from '@/lib/api-error';
import type { components } from '@evenhand/contract';
import { payoutKeys } from './payout-keys';

export type ApprovalResult = components['schemas']['ApprovalResultDto'];

/** The api's BALANCE_TOO_LOW when approving would spend more than the study's funded balance (payout-approval.service.ts). */
export class BudgetShortfallError extends ApiError {
  readonly neededMinor: number;
  readonly remainingMinor: number;

  constructor(message: string, neededMinor: number, remainingMinor: number) {
    super({ statusCode: 409, code: 'BALANCE_TOO_LOW', message });
    this.name = 'BudgetShortfallError';
    this.neededMinor = neededMinor;
    this.remainingMinor = remainingMinor;
  }
}

export async function approvePayouts(studyId: string, payoutIds: string[]): Promise<ApprovalResult> {
  let result;
  try {
    result = await apiClient.POST('/api/studies/{studyId}/payouts/approve', {
      params: { path: { studyId } },
      body: { payoutIds },
    });
  } catch {
    throw new ApiError({
      statusCode: 0,
      code: 'NETWORK',
      message: 'Could not reach the Evenhand server. Check your connection and try again.',
    });
  }
  if (result.response.ok && result.data) return result.data;
  const body = result.error as Record<string, unknown> | undefined;
  if (body?.code === 'BALANCE_TOO_LOW' && typeof body.remainingMinor === 'number') {
    throw new BudgetShortfallError(String(body.message ?? ''), Number(body.neededMinor ?? 0), body.remainingMinor);
  }
  throw new ApiError(toApiProblem(result.response.status, result.error));
}

// Sent in slices so a large batch shows its progress and one refusal does not undo what was already approved.
export const approvalSliceSize = 200;

export interface ApprovalProgress {
  sent: number;
  total: number;
}

/** Approves the payouts slice by slice; stops at the first refusal and reports how many went through. */
export async function approveInSlices(
  studyId: string,
  payoutIds: string[],
  onProgress: (progress: ApprovalProgress) => void,
): Promise<{ approved: number; amountMinor: number }> {
  let approved = 0;
  let amountMinor = 0;
  onProgress({ sent: 0, total: payoutIds.length });
  for (let start = 0; start < payoutIds.length; start += approvalSliceSize) {
    const slice = payoutIds.slice(start, start + approvalSliceSize);
    try {
      const result = await approvePayouts(studyId, slice);
      approved += result.approved;
      amountMinor += result.amountMinor;
    } catch (error) {
      if (error instanceof ApiError) Object.assign(error, { approvedBefore: approved });
      throw error;
    }
    onProgress({ sent: Math.min(start + slice.length, payoutIds.length), total: payoutIds.length });
  }
  return { approved, amountMinor };
}

/** How many payouts of this run were approved before a refusal (0 when the first slice was refused). */
export function approvedBeforeRefusal(error: unknown): number {
  return typeof (error as { approvedBefore?: unknown })?.approvedBefore === 'number'
    ? (error as { approvedBefore: number }).approvedBefore
    : 0;
}

export function useApprovePayouts(studyId: string, onProgress: (progress: ApprovalProgress) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (payoutIds: string[]) => approveInSlices(studyId, payoutIds, onProgress),
    onSettled: () => queryClient.invalidateQueries({ queryKey: payoutKeys.all(studyId) }),
  });
}
