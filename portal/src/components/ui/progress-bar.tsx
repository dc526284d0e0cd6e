/** How far along someone is, with the words a screen reader says ("Part 2 of 9"). */
export function ProgressBar({
  value,
  max,
  label,
  valueText,
}: {
  value: number;
  max: number;
  label: string;
  valueText: string;
}) {
  const percent = max === 0 ? 0 : Math.round((value / max) * 100);
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={max}
      aria-valuenow={value}
      aria-valuetext={valueText}
      className="h-2.5 w-full overflow-hidden rounded-full bg-sand-deep"
    >
      <div className="h-full rounded-full bg-moss transition-[width] duration-300" style={{ width: `${percent}%` }} />
    </div>
  );
}
