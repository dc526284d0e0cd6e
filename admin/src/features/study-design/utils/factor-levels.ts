/**
 * The levels a stratification factor splits people into, as the api names them (api/src/randomization/strata.ts):
 * a value at a cut point belongs to the level at or above it. Cut 50 gives "<50" and "≥50"; cuts 40, 65 give
 * "<40", "≥40 <65" and "≥65".
 */
export function numericLevels(cutPoints: readonly number[]): string[] {
  if (cutPoints.length === 0) return [];
  return Array.from({ length: cutPoints.length + 1 }, (_, index) => {
    if (index === 0) return `<${cutPoints[0]}`;
    if (index === cutPoints.length) return `≥${cutPoints[cutPoints.length - 1]}`;
    return `≥${cutPoints[index - 1]} <${cutPoints[index]}`;
  });
}

/** A problem with a list of cut points, or null: they must rise strictly, as the api requires. */
export function cutPointProblem(cutPoints: readonly number[]): string | null {
  for (let i = 1; i < cutPoints.length; i++) {
    const previous = cutPoints[i - 1] as number;
    const cut = cutPoints[i] as number;
    if (cut === previous) return `${cut} is listed twice; each cut point must be different.`;
    if (cut < previous) return `${cut} comes after ${previous}; list cut points from low to high.`;
  }
  return null;
}

/** How many strata the factors make together: the product of their level counts. */
export function stratumCount(levelCounts: readonly number[]): number {
  return levelCounts.reduce((product, count) => product * Math.max(count, 1), 1);
}
