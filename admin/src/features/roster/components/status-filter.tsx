import { cx } from '@/components/ui/cx';
import type { EnrollmentStatus } from '../api/get-roster';
import { enrollmentStatusLabels, enrollmentStatusOrder } from './enrollment-status-badge';

const chipClass =
  'inline-flex h-7 items-center gap-1.5 rounded-full border px-3 text-sm font-medium transition-colors focus:outline-none focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce';
const chipOn = 'border-spruce bg-spruce text-ink-inverse';
const chipOff = 'border-line-strong bg-surface text-ink hover:bg-sunken';

export interface StatusFilterProps {
  countsByStatus: Record<string, number>;
  status: EnrollmentStatus | null;
  onStatus: (status: EnrollmentStatus | null) => void;
  needsReconsent: boolean;
  reconsentCount: number | undefined;
  onNeedsReconsent: (on: boolean) => void;
}

/** Filter chips with counts; statuses nobody is in are left out unless chosen. */
export function StatusFilter({
  countsByStatus,
  status,
  onStatus,
  needsReconsent,
  reconsentCount,
  onNeedsReconsent,
}: StatusFilterProps) {
  const total = Object.values(countsByStatus).reduce((sum, count) => sum + count, 0);
  const shown = enrollmentStatusOrder.filter(
    (candidate) => (countsByStatus[candidate] ?? 0) > 0 || candidate === status,
  );
  return (
    <div className="flex flex-wrap items-center gap-2">
      <div role="group" aria-label="Show people by status" className="flex flex-wrap gap-1.5">
        <Chip pressed={status === null} onClick={() => onStatus(null)} label="All statuses" count={total} />
        {shown.map((candidate) => (
          <Chip
            key={candidate}
            pressed={status === candidate}
            onClick={() => onStatus(status === candidate ? null : candidate)}
            label={enrollmentStatusLabels[candidate].label}
            count={countsByStatus[candidate] ?? 0}
          />
        ))}
      </div>
      <span aria-hidden="true" className="mx-1 h-5 w-px bg-line-strong" />
      <Chip
        pressed={needsReconsent}
        onClick={() => onNeedsReconsent(!needsReconsent)}
        label="Needs re-consent"
        count={reconsentCount}
      />
    </div>
  );
}

function Chip({
  pressed,
  onClick,
  label,
  count,
}: {
  pressed: boolean;
  onClick: () => void;
  label: string;
  count: number | undefined;
}) {
  return (
    <button
      type="button"
      aria-pressed={pressed}
      onClick={onClick}
      className={cx(chipClass, pressed ? chipOn : chipOff)}
    >
      {label}
      {count !== undefined && (
        <span className={cx('tabular-nums text-xs', pressed ? 'text-ink-inverse/85' : 'text-ink-muted')}>{count}</span>
      )}
    </button>
  );
}
