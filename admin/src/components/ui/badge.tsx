import { cx } from './cx';
import { badgeRecipe } from './recipes';

export type BadgeTone = keyof typeof badgeRecipe.tones;

export function Badge({ tone = 'neutral', children }: { tone?: BadgeTone; children: React.ReactNode }) {
  return <span className={cx(badgeRecipe.base, badgeRecipe.tones[tone])}>{children}</span>;
}
