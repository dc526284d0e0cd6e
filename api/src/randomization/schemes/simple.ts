/**
 * Simple randomization with weights: each slot independently picks a condition with probability
 * weight / totalWeight, as integerBelow(totalWeight) walked through the cumulative weights in listed order,
 * from the stream labelled `simple:all`.
 */
import { parseParametersOf, SimpleParameters } from '../scheme-parameters';
import { createSeededStream, streamLabel } from '../seeded-stream';
import { UNSTRATIFIED_STRATUM_KEY } from '../strata';
import { AllocationSlot, checkSlotCount } from './allocation-slot';

export function generateSimpleSequence(seed: string, parameters: SimpleParameters, count: number): AllocationSlot[] {
  const checked = parseParametersOf(parameters, ['simple']);
  const slotCount = checkSlotCount(count);
  const stream = createSeededStream(seed, streamLabel.simple(UNSTRATIFIED_STRATUM_KEY));
  const weights = checked.conditions.map((c) => c.weight);
  const slots: AllocationSlot[] = [];
  for (let position = 1; position <= slotCount; position++) {
    slots.push({
      stratumKey: UNSTRATIFIED_STRATUM_KEY,
      position,
      conditionId: checked.conditions[stream.weightedPick(weights)].conditionId,
      blockIndex: null,
      blockSize: null,
      positionInBlock: null,
    });
  }
  return slots;
}
