import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/notice';
import { TextAreaField } from '@/components/ui/text-area-field';
import { describeProblem } from '@/lib/problem-message';
import { formatMinor } from '@/lib/money';
import type { MyEnrollment } from '../api/get-my-enrollment';
import {
  reasonCountInWords,
  useWithdraw,
  WITHDRAWAL_REASON_MAX,
  type Withdrawal,
  withdrawFormSchema,
  type WithdrawFormValues,
  type WithdrawRequest,
} from '../api/withdraw';

type WithdrawDialogProps = {
  open: boolean;
  onClose: () => void;
  studyId: string;
  currency: string;
  earned: MyEnrollment['earned'];
  onWithdrawn: (withdrawal: Withdrawal) => void;
};

/** Asks once, plainly, before someone stops taking part; shows what they keep. */
export function WithdrawDialog({ open, onClose, studyId, currency, earned, onWithdrawn }: WithdrawDialogProps) {
  const withdraw = useWithdraw();
  const { control, handleSubmit, formState, watch, reset } = useForm<WithdrawFormValues, unknown, WithdrawRequest>({
    resolver: zodResolver(withdrawFormSchema),
    mode: 'onTouched',
    defaultValues: { reason: '' },
  });
  const money = (minor: number) => formatMinor(minor, currency);
  const reasonLength = watch('reason').length;

  const close = () => {
    if (withdraw.isPending) return;
    withdraw.reset();
    reset();
    onClose();
  };

  const submit = handleSubmit(async (body) => {
    try {
      onWithdrawn(await withdraw.mutateAsync({ studyId, body }));
    } catch {
      // Shown below from the mutation's state.
    }
  });

  return (
    <ModalDialog open={open} onClose={close} title="Stop taking part?">
      <form noValidate onSubmit={submit} className="flex flex-col gap-5">
        <p>You can stop at any time, and you do not have to say why. Nothing bad happens if you do.</p>

        <div className="flex flex-col gap-2 rounded-soft bg-sand px-4 py-3">
          <p className="font-semibold">What you have earned</p>
          <dl className="flex flex-col gap-1">
            <div className="flex justify-between gap-3">
              <dt>Earned so far</dt>
              <dd className="font-bold">{money(earned.earnedMinor)}</dd>
            </div>
            <div className="flex justify-between gap-3">
              <dt>Already paid to you</dt>
              <dd className="font-bold">{money(earned.paidMinor)}</dd>
            </div>
            <div className="flex justify-between gap-3">
              <dt>Still to be paid to you</dt>
              <dd className="font-bold">{money(earned.stillToBePaidMinor)}</dd>
            </div>
          </dl>
          <p className="text-fine">You keep all of it; what is still owed is paid as usual.</p>
        </div>

        <p className="text-fine">
          What you have done so far stays on record, as the study's ethics approval requires; nothing new is collected.
          We will send you an e-mail to confirm.
        </p>

        <Controller
          name="reason"
          control={control}
          render={({ field, fieldState }) => (
            <TextAreaField
              {...field}
              label="Would you like to tell us why? (optional)"
              hint={`It helps the research team improve the study. Up to ${WITHDRAWAL_REASON_MAX} characters; ${reasonCountInWords(
                reasonLength,
              )}.`}
              error={fieldState.error?.message}
              rows={3}
            />
          )}
        />

        {withdraw.isError ? (
          <Notice tone="error" title="We could not stop your participation">
            {describeProblem(withdraw.error)} You are still taking part.
          </Notice>
        ) : null}

        <div className="flex flex-col gap-3">
          <Button type="submit" wide disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Stopping…' : 'Yes, stop taking part'}
          </Button>
          <Button variant="secondary" wide onClick={close} disabled={formState.isSubmitting}>
            No, keep taking part
          </Button>
        </div>
      </form>
    </ModalDialog>
  );
}
