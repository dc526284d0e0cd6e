import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';
import { storeMyEnrollment } from './get-my-enrollment';

export type Withdrawal =
  paths['/api/studies/{studyId}/enrollments/me/withdraw']['post']['responses'][200]['content']['application/json'];

export const WITHDRAWAL_REASON_MAX = 1000;

/** The counter under the reason: how many characters are left, or by how many the text is over the limit. */
export function reasonCountInWords(length: number, max = WITHDRAWAL_REASON_MAX): string {
  const characters = (count: number) => (count === 1 ? '1 character' : `${count} characters`);
  return length > max ? `${characters(length - max)} too many` : `${characters(max - length)} left`;
}

export const withdrawFormSchema = z
  .object({
    reason: z
      .string()
      .trim()
      .max(WITHDRAWAL_REASON_MAX, `Please keep your reason to ${WITHDRAWAL_REASON_MAX} characters or fewer.`),
  })
  // An empty reason is no reason: nothing is sent, so "no reason given" stays distinguishable from a blank one.
  .transform(({ reason }) => (reason === '' ? {} : { reason }));

export type WithdrawFormValues = z.input<typeof withdrawFormSchema>;
export type WithdrawRequest = z.output<typeof withdrawFormSchema>;

export async function withdraw({ studyId, body }: { studyId: string; body: WithdrawRequest }): Promise<Withdrawal> {
  const { data, error, response } = await api.POST('/api/studies/{studyId}/enrollments/me/withdraw', {
    params: { path: { studyId } },
    body,
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export function useWithdraw() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: withdraw,
    onSuccess: (withdrawal) => {
      storeMyEnrollment(queryClient, withdrawal.enrollment);
      void queryClient.invalidateQueries({ queryKey: queryKeys.myStudies });
    },
  });
}
