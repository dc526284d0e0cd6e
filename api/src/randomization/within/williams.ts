/**
 * Williams design (Williams 1949, Australian Journal of Scientific Research A2:149-168, from memory), balanced for
 * first-order carryover: every condition is immediately preceded by every other condition equally often.
 * Construction: reorder the columns of the cyclic Latin square as 1, 2, n, 3, n−1, 4, n−2, …; for even n
 * that square is the design, for odd n the square plus its mirror (each order reversed), 2n orders.
 */
import { checkDistinctConditions } from './latin-square';

export function williamsDesign(conditionIds: readonly string[]): string[][] {
  checkDistinctConditions(conditionIds, 3, 'a Williams design');
  const n = conditionIds.length;
  const firstRow = [0];
  for (let low = 1, high = n - 1, takeLow = true; firstRow.length < n; takeLow = !takeLow) {
    firstRow.push(takeLow ? low++ : high--);
  }
  const square = conditionIds.map((_, row) => firstRow.map((column) => conditionIds[(column + row) % n]));
  return n % 2 === 0 ? square : [...square, ...square.map((order) => order.slice().reverse())];
}

export interface CarryoverBalance {
  /** True when every ordered pair of distinct conditions is adjacent (first, then second) equally often. */
  balanced: boolean;
  /** That common count when balanced, else null. */
  timesEachPairAdjacent: number | null;
  /** Count per ordered pair, keyed "first>second". */
  pairCounts: Record<string, number>;
}

export function carryoverBalance(orders: readonly (readonly string[])[]): CarryoverBalance {
  const conditions = [...new Set(orders.flat())];
  const pairCounts: Record<string, number> = {};
  for (const a of conditions) for (const b of conditions) if (a !== b) pairCounts[`${a}>${b}`] = 0;
  let selfAdjacent = false;
  for (const order of orders) {
    for (let i = 1; i < order.length; i++) {
      if (order[i - 1] === order[i]) selfAdjacent = true;
      else pairCounts[`${order[i - 1]}>${order[i]}`] += 1;
    }
  }
  const counts = Object.values(pairCounts);
  const balanced = !selfAdjacent && counts.length > 0 && counts.every((c) => c === counts[0]) && counts[0] > 0;
  return { balanced, timesEachPairAdjacent: balanced ? counts[0] : null, pairCounts };
}
