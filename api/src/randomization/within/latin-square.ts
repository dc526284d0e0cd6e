/** Cyclic Latin square: order i is the condition list rotated by i, so each condition takes each position once. */
import { fail, RandomizationErrorCode } from '../randomization-error';

export function checkDistinctConditions(conditionIds: readonly string[], minimum: number, design: string): void {
  if (conditionIds.length < minimum) {
    fail(
      RandomizationErrorCode.InvalidParameters,
      'conditionIds',
      `${design} needs at least ${minimum} conditions (got ${conditionIds.length})`,
    );
  }
  if (new Set(conditionIds).size !== conditionIds.length) {
    fail(RandomizationErrorCode.InvalidParameters, 'conditionIds', 'must not list a condition twice');
  }
}

export function cyclicLatinSquare(conditionIds: readonly string[]): string[][] {
  checkDistinctConditions(conditionIds, 3, 'a Latin square');
  const n = conditionIds.length;
  return conditionIds.map((_, row) => conditionIds.map((__, column) => conditionIds[(row + column) % n]));
}

/** n orders of n distinct conditions where every condition appears once in every order and once in every position. */
export function isLatinSquare(orders: readonly (readonly string[])[]): boolean {
  const n = orders.length;
  if (n === 0) return false;
  const symbols = new Set(orders[0]);
  if (symbols.size !== n) return false;
  for (const order of orders) {
    if (order.length !== n || new Set(order).size !== n || order.some((c) => !symbols.has(c))) return false;
  }
  for (let column = 0; column < n; column++) {
    if (new Set(orders.map((order) => order[column])).size !== n) return false;
  }
  return true;
}
