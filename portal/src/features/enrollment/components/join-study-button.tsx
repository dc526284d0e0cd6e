import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-problem';
import { describeProblem } from '@/lib/problem-message';
import { useJoinStudy } from '../api/join-study';

/** "Take part" for someone signed in who has not joined yet. */
export function JoinStudyButton({ studyId }: { studyId: string }) {
  const join = useJoinStudy();
  return (
    <div className="flex flex-col gap-3" aria-live="polite">
      {join.isError ? (
        <Notice tone="error" title="We could not add you to the study">
          {isApiError(join.error, 'STUDY_NOT_RECRUITING')
            ? 'This study is not taking new people just now. Please come back to this page later.'
            : describeProblem(join.error)}
        </Notice>
      ) : null}
      <Button wide onClick={() => join.mutate(studyId)} disabled={join.isPending}>
        {join.isPending ? 'Starting…' : 'Take part'}
      </Button>
      <p className="text-fine text-ink-soft">
        Next you answer a few questions, then read the consent form. Nothing is agreed until you sign it.
      </p>
    </div>
  );
}
