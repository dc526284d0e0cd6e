/**
 * Handing out within-subjects orders in permuted blocks of whole squares: each block is a shuffled copy of
 * all the design's orders (or of squaresPerBlock copies, the count drawn per block from the allowed list),
 * from the stream labelled `orders:<stratumKey>` — the same block engine as between-subjects blocks, with
 * every order weighted 1.
 */
import { fail, RandomizationErrorCode } from '../randomization-error';
import { parseParametersOf, WithinOrdersParameters, WITHIN_DESIGNS } from '../scheme-parameters';
import { createSeededStream, streamLabel } from '../seeded-stream';
import { allStratumKeys, Covariates, stratumKeyFor } from '../strata';
import { checkSlotCount } from '../schemes/allocation-slot';
import { drawPermutedBlocks } from '../schemes/permuted-blocks';
import { counterbalancedOrders } from './counterbalance';
import { cyclicLatinSquare } from './latin-square';
import { williamsDesign } from './williams';

/** One pre-generated place in a stratum's sequence of condition orders. */
export interface OrderSlot {
  stratumKey: string;
  position: number;
  /** 0-based index into designOrders(parameters). */
  orderIndex: number;
  order: string[];
  blockIndex: number;
  blockSize: number;
  positionInBlock: number;
}

export function designOrders(parameters: WithinOrdersParameters): string[][] {
  const checked = parseParametersOf(parameters, WITHIN_DESIGNS);
  return ordersOf(checked);
}

export function ordersOf(parameters: WithinOrdersParameters): string[][] {
  switch (parameters.method) {
    case 'counterbalanced':
      return counterbalancedOrders(parameters.conditionIds);
    case 'latin-square':
      return cyclicLatinSquare(parameters.conditionIds);
    case 'williams':
      return williamsDesign(parameters.conditionIds);
  }
}

export function orderStratumOf(parameters: WithinOrdersParameters, covariates: Covariates): string {
  const checked = parseParametersOf(parameters, WITHIN_DESIGNS);
  return stratumKeyFor(checked.factors, covariates);
}

export function orderSlots(
  seed: string,
  parameters: WithinOrdersParameters,
  stratumKey: string,
  count: number,
): OrderSlot[] {
  const orders = ordersOf(parameters);
  const stream = createSeededStream(seed, streamLabel.orders(stratumKey));
  const blockSizes = parameters.squaresPerBlock.map((squares) => squares * orders.length);
  return drawPermutedBlocks(
    stream,
    orders.map(() => 1),
    blockSizes,
    count,
  ).map((draw, i) => ({
    stratumKey,
    position: i + 1,
    orderIndex: draw.itemIndex,
    order: orders[draw.itemIndex].slice(),
    blockIndex: draw.blockIndex,
    blockSize: draw.blockSize,
    positionInBlock: draw.positionInBlock,
  }));
}

/** The first `count` order slots of one stratum ("all" when the design is not stratified). */
export function generateOrderSequence(
  seed: string,
  parameters: WithinOrdersParameters,
  stratumKey: string,
  count: number,
): OrderSlot[] {
  const checked = parseParametersOf(parameters, WITHIN_DESIGNS);
  const strata = allStratumKeys(checked.factors);
  if (!strata.includes(stratumKey)) {
    fail(
      RandomizationErrorCode.InvalidInput,
      'stratumKey',
      `"${stratumKey}" is not a stratum of this design (strata: ${strata.join(', ')})`,
    );
  }
  return orderSlots(seed, checked, stratumKey, checkSlotCount(count));
}
