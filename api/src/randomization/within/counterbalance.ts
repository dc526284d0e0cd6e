/** AB/BA counterbalancing for two conditions: half the participants take A then B, half B then A. */
import { fail, RandomizationErrorCode } from '../randomization-error';

export function counterbalancedOrders(conditionIds: readonly string[]): string[][] {
  if (conditionIds.length !== 2 || conditionIds[0] === conditionIds[1]) {
    fail(
      RandomizationErrorCode.InvalidParameters,
      'conditionIds',
      'AB/BA counterbalancing needs exactly two different conditions',
    );
  }
  const [a, b] = conditionIds;
  return [
    [a, b],
    [b, a],
  ];
}
