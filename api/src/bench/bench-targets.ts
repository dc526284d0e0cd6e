/** A ratio a benchmark must reach in one run: at least (rates) or at most (times) the given value. */
export interface BenchTarget {
  label: string;
  ratio: number;
  /** 'at-least': the ratio must be ≥ value; 'at-most': ≤ value; null: printed for information, no target. */
  bound: 'at-least' | 'at-most' | null;
  value: number | null;
}

export interface TargetVerdict extends BenchTarget {
  met: boolean;
}

export function judge(target: BenchTarget): TargetVerdict {
  if (!Number.isFinite(target.ratio)) return { ...target, met: false };
  if (target.bound === null || target.value === null) return { ...target, met: true };
  return { ...target, met: target.bound === 'at-least' ? target.ratio >= target.value : target.ratio <= target.value };
}

/** One line per ratio: the figure, its target and whether it is met; e.g. `sign ÷ bare INSERT  0.512  target ≥ 0.5  met`. */
export function formatVerdicts(verdicts: readonly TargetVerdict[]): string {
  const width = Math.max(...verdicts.map((v) => v.label.length));
  return verdicts
    .map((v) => {
      const target =
        v.bound === null ? 'no target (for information)' : `target ${v.bound === 'at-least' ? '≥' : '≤'} ${v.value}`;
      const verdict = v.bound === null ? '' : v.met ? 'met' : 'MISSED';
      return `${v.label.padEnd(width)}  ${v.ratio.toFixed(3).padStart(8)}  ${target}  ${verdict}`.trimEnd();
    })
    .join('\n');
}

/** The exit code for a run: 0 when every target is met, 2 when any is missed (1 stays for a failed run). */
export function exitCodeFor(verdicts: readonly TargetVerdict[]): number {
  return verdicts.every((v) => v.met) ? 0 : 2;
}
