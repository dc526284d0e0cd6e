/** Where someone is in a short journey ("Questions → Consent → Your steps"); the current stage is announced. */
export function StageList({ stages, current, label }: { stages: string[]; current: number; label: string }) {
  return (
    <ol aria-label={label} className="flex gap-2 text-fine">
      {stages.map((stage, index) => {
        const state = index < current ? 'done' : index === current ? 'current' : 'ahead';
        return (
          <li
            key={stage}
            aria-current={state === 'current' ? 'step' : undefined}
            className={`flex flex-1 flex-col gap-1 border-t-4 pt-1 ${
              state === 'ahead'
                ? 'border-sand-deep text-ink-soft'
                : state === 'current'
                  ? 'border-clay font-bold'
                  : 'border-moss'
            }`}
          >
            <span>
              {state === 'done' ? <span className="sr-only">Done: </span> : null}
              {stage}
            </span>
          </li>
        );
      })}
    </ol>
  );
}
