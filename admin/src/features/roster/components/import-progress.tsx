import { IndeterminateProgress } from '@/components/ui/progress-bar';
import { progressRecipe } from '@/components/ui/recipes';
import type { ImportProgress as Progress } from '../api/import-roster';
import { formatFileSize } from '../utils/file-size';
import { percentDone } from '../utils/roster-file-checks';

const stageLabels: Record<Progress['stage'], string> = {
  reading: 'Reading the file',
  uploading: 'Uploading',
  checking: 'Checking every row on the server',
};

/** Reading and uploading have a known length (a determinate bar); the server's check answers once, when done. */
export function ImportProgress({ progress }: { progress: Progress }) {
  const label = stageLabels[progress.stage];
  if (progress.stage === 'checking') {
    return (
      <div className="flex flex-col gap-1.5">
        <p className="text-sm text-ink">{label}…</p>
        <IndeterminateProgress label={label} />
      </div>
    );
  }
  const percent = percentDone(progress.loaded, progress.total);
  return (
    <div className="flex flex-col gap-1.5">
      <p className="flex justify-between text-sm text-ink">
        <span>{label}…</span>
        <span className="tabular-nums text-ink-muted">
          {formatFileSize(progress.loaded)} of {formatFileSize(progress.total)} · {percent}%
        </span>
      </p>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        className={progressRecipe.track}
      >
        <div
          className="absolute inset-y-0 left-0 rounded-full bg-spruce transition-[width] duration-150"
          style={{ width: `${percent}%` }}
        />
      </div>
    </div>
  );
}
