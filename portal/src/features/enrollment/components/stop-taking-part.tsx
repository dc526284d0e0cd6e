import { useState } from 'react';
import { Button } from '@/components/ui/button';
import type { MyEnrollment } from '../api/get-my-enrollment';
import type { Withdrawal } from '../api/withdraw';
import { WithdrawDialog } from './withdraw-dialog';

type StopTakingPartProps = {
  enrollment: Pick<MyEnrollment, 'studyId' | 'currency' | 'earned'>;
  onWithdrawn: (withdrawal: Withdrawal) => void;
};

/** Always within reach while someone takes part: stopping is their right at any point. */
export function StopTakingPart({ enrollment, onWithdrawn }: StopTakingPartProps) {
  const [open, setOpen] = useState(false);
  return (
    <section aria-labelledby="stop-heading" className="flex flex-col gap-3 border-t border-sand-deep pt-6">
      <h2 id="stop-heading" className="text-lead font-bold">
        Want to stop?
      </h2>
      <p className="text-fine">
        You can stop taking part at any time, without giving a reason. You keep what you have earned.
      </p>
      <Button variant="secondary" wide onClick={() => setOpen(true)}>
        Stop taking part
      </Button>
      <WithdrawDialog
        open={open}
        onClose={() => setOpen(false)}
        studyId={enrollment.studyId}
        currency={enrollment.currency}
        earned={enrollment.earned}
        onWithdrawn={(withdrawal) => {
          setOpen(false);
          onWithdrawn(withdrawal);
        }}
      />
    </section>
  );
}
