import { useId } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { describeProblem } from '@/lib/problem-message';
import { needsReconsent } from '../api/complete-step';
import { useStartStepTask } from '../api/start-step-task';

type OpenTaskButtonProps = {
  studyId: string;
  stepId: string;
  /** The step's heading, read out with the button so several open steps are told apart. */
  describedBy: string;
  /** The step also takes a code, for when the task does not bring the person back. */
  alsoTakesCode: boolean;
  onNeedsReconsent?: (() => void) | undefined;
};

/** Leaves for the lab's task for this step; the task sends the person back to the portal, which marks the step done. */
export function OpenTaskButton({ studyId, stepId, describedBy, alsoTakesCode, onNeedsReconsent }: OpenTaskButtonProps) {
  const start = useStartStepTask();
  const explanationId = useId();
  // After success the browser is already on its way to the task.
  const leaving = start.isPending || start.isSuccess;

  const open = () =>
    start.mutate(
      { studyId, stepId },
      {
        onError: (error) => {
          if (needsReconsent(error)) onNeedsReconsent?.();
        },
      },
    );

  return (
    <div className="flex flex-col gap-3 border-t border-sand-deep pt-3">
      <p id={explanationId} className="text-fine">
        The task opens on the research team’s own site. When you finish it, you are brought back here and the step is
        marked done.
        {alsoTakesCode ? ' If that does not happen, enter the code the task shows you at its end below.' : null}
      </p>
      {start.isError && !needsReconsent(start.error) ? (
        <Notice tone="error" title="We could not open the task">
          {describeProblem(start.error)}
        </Notice>
      ) : null}
      <Button wide onClick={open} disabled={leaving} aria-describedby={`${describedBy} ${explanationId}`}>
        {leaving ? 'Opening the task…' : 'Open the task'}
      </Button>
    </div>
  );
}
