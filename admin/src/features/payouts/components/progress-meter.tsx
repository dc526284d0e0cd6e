import { progressRecipe } from '@/components/ui/recipes';

/** A bar for work whose share done is known, e.g. "120 of 450 sent". */
export function ProgressMeter({ label, share, valueText }: { label: string; share: number; valueText: string }) {
  const percent = Math.round(Math.min(1, Math.max(0, share)) * 100);
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={percent}
      aria-valuetext={valueText}
      className={progressRecipe.track}
    >
      <div
        className="absolute inset-y-0 left-0 rounded-full bg-spruce transition-[width] duration-300"
        style={{ width: `${percent}%` }}
      />
    </div>
  );
}
