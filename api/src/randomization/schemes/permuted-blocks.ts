/**
 * Permuted blocks with random block sizes.
 *
 * The sequence for a stratum comes from the stream labelled `blocks:<stratumKey>`. Block after block:
 * draw the size as blockSizes[integerBelow(number of sizes)] (drawn even when only one size is allowed),
 * lay out each condition weight × size / totalWeight times in the listed order, shuffle that (Fisher–Yates),
 * and append it. Asking for more slots later yields the same first slots plus new ones, and every complete
 * block holds each condition exactly in its ratio.
 */
import { ConditionAllocation, parseParametersOf, PermutedBlocksParameters, totalWeight } from '../scheme-parameters';
import { createSeededStream, SeededStream, streamLabel } from '../seeded-stream';
import { UNSTRATIFIED_STRATUM_KEY } from '../strata';
import { AllocationSlot, checkSlotCount } from './allocation-slot';

export interface BlockDraw {
  /** Index into the weights list the block was built from. */
  itemIndex: number;
  blockIndex: number;
  blockSize: number;
  positionInBlock: number;
}

/** The block engine shared by between-subjects blocks and within-subjects order blocks. */
export function drawPermutedBlocks(
  stream: SeededStream,
  weights: readonly number[],
  blockSizes: readonly number[],
  count: number,
): BlockDraw[] {
  const total = weights.reduce((a, b) => a + b, 0);
  const draws: BlockDraw[] = [];
  for (let blockIndex = 1; draws.length < count; blockIndex++) {
    const blockSize = blockSizes[stream.integerBelow(blockSizes.length)];
    const copies = blockSize / total;
    const layout: number[] = [];
    weights.forEach((weight, itemIndex) => {
      for (let k = 0; k < weight * copies; k++) layout.push(itemIndex);
    });
    const block = stream.shuffle(layout);
    for (let i = 0; i < block.length && draws.length < count; i++) {
      draws.push({ itemIndex: block[i], blockIndex, blockSize, positionInBlock: i + 1 });
    }
  }
  return draws;
}

export function blockSlots(
  seed: string,
  conditions: readonly ConditionAllocation[],
  blockSizes: readonly number[],
  stratumKey: string,
  count: number,
): AllocationSlot[] {
  const stream = createSeededStream(seed, streamLabel.blocks(stratumKey));
  return drawPermutedBlocks(
    stream,
    conditions.map((c) => c.weight),
    blockSizes,
    count,
  ).map((draw, i) => ({
    stratumKey,
    position: i + 1,
    conditionId: conditions[draw.itemIndex].conditionId,
    blockIndex: draw.blockIndex,
    blockSize: draw.blockSize,
    positionInBlock: draw.positionInBlock,
  }));
}

/** The first `count` slots of the study's single (unstratified) block sequence. */
export function generatePermutedBlockSequence(
  seed: string,
  parameters: PermutedBlocksParameters,
  count: number,
): AllocationSlot[] {
  const checked = parseParametersOf(parameters, ['permuted-blocks']);
  return blockSlots(seed, checked.conditions, checked.blockSizes, UNSTRATIFIED_STRATUM_KEY, checkSlotCount(count));
}

/** How many times each condition appears in one complete block of this size. */
export function expectedBlockCounts(
  conditions: readonly ConditionAllocation[],
  blockSize: number,
): Record<string, number> {
  const copies = blockSize / totalWeight(conditions);
  return Object.fromEntries(conditions.map((c) => [c.conditionId, c.weight * copies]));
}
