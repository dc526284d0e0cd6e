import { progressRecipe } from './recipes';

/** A bar for work whose length is unknown (one request that answers when it is done). */
export function IndeterminateProgress({ label }: { label: string }) {
  return (
    <div role="progressbar" aria-label={label} aria-busy="true" className={progressRecipe.track}>
      <div className={progressRecipe.indeterminateBar} />
    </div>
  );
}
