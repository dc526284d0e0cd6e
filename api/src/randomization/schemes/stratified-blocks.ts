/**
 * Stratified permuted blocks for participants who arrive one at a time: one independent block sequence
 * per stratum, from the stream labelled `blocks:<stratumKey>`. Strata come from numeric cut points and
 * categories (see strata.ts, which also explains why a pretest stratifies rather than assigns by cut-off).
 */
import { fail, RandomizationErrorCode } from '../randomization-error';
import { parseParametersOf, StratifiedBlocksParameters } from '../scheme-parameters';
import { allStratumKeys, Covariates, stratumKeyFor } from '../strata';
import { AllocationSlot, checkSlotCount } from './allocation-slot';
import { blockSlots } from './permuted-blocks';

export { PRETEST_CUTOFF_EXPLANATION } from '../strata';

/** The stratum a participant belongs to; a clear error names each missing or unknown covariate. */
export function stratumOfParticipant(parameters: StratifiedBlocksParameters, covariates: Covariates): string {
  const checked = parseParametersOf(parameters, ['stratified-blocks']);
  return stratumKeyFor(checked.factors, covariates);
}

/** The first `count` slots of one stratum's sequence. */
export function generateStratumSequence(
  seed: string,
  parameters: StratifiedBlocksParameters,
  stratumKey: string,
  count: number,
): AllocationSlot[] {
  const checked = parseParametersOf(parameters, ['stratified-blocks']);
  const strata = allStratumKeys(checked.factors);
  if (!strata.includes(stratumKey)) {
    fail(
      RandomizationErrorCode.InvalidInput,
      'stratumKey',
      `"${stratumKey}" is not a stratum of these factors (strata: ${strata.join(', ')})`,
    );
  }
  return blockSlots(seed, checked.conditions, checked.blockSizes, stratumKey, checkSlotCount(count));
}

/** The first `slotsPerStratum` slots of every stratum's sequence, keyed by stratum key. */
export function generateStratifiedSequences(
  seed: string,
  parameters: StratifiedBlocksParameters,
  slotsPerStratum: number,
): Record<string, AllocationSlot[]> {
  const checked = parseParametersOf(parameters, ['stratified-blocks']);
  const count = checkSlotCount(slotsPerStratum, 'slotsPerStratum');
  return Object.fromEntries(
    allStratumKeys(checked.factors).map((key) => [
      key,
      blockSlots(seed, checked.conditions, checked.blockSizes, key, count),
    ]),
  );
}
