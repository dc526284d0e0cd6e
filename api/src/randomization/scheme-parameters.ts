import {
  checkSchemeParameters,
  DEFAULT_COIN_PROBABILITY,
  DEFAULT_IMBALANCE_MEASURE,
  MAX_BLOCK_SIZE,
  MAX_SQUARES_PER_BLOCK,
  SCHEME_METHODS,
  totalWeight as totalOfWeights,
  WITHIN_DESIGNS,
  type BetweenSchemeParameters,
  type CategoricalFactor,
  type ConditionAllocation,
  type ImbalanceMeasure,
  type MatchedPairsParameters,
  type MinimizationFactor,
  type MinimizationParameters,
  type NumericFactor,
  type PermutedBlocksParameters,
  type SchemeMethod,
  type SchemeParameters,
  type SimpleParameters,
  type StratificationFactor,
  type StratifiedBlocksParameters,
  type WithinDesign,
  type WithinOrdersParameters,
} from '@evenhand/contract/schemas';
import { FieldError, RandomizationError, RandomizationErrorCode } from './randomization-error';

// The rules of each scheme live in the contract (api/contract/src/schemas/scheme-parameters.ts), shared with the
// admin screens and published in the OpenAPI document; the engine works on what they let through.
export {
  DEFAULT_COIN_PROBABILITY,
  DEFAULT_IMBALANCE_MEASURE,
  MAX_BLOCK_SIZE,
  MAX_SQUARES_PER_BLOCK,
  SCHEME_METHODS,
  WITHIN_DESIGNS,
};
export type {
  BetweenSchemeParameters,
  CategoricalFactor,
  ConditionAllocation,
  ImbalanceMeasure,
  MatchedPairsParameters,
  MinimizationFactor,
  MinimizationParameters,
  NumericFactor,
  PermutedBlocksParameters,
  SchemeMethod,
  SchemeParameters,
  SimpleParameters,
  StratificationFactor,
  StratifiedBlocksParameters,
  WithinDesign,
  WithinOrdersParameters,
};

export type ValidationResult<T> = { ok: true; value: T } | { ok: false; errors: FieldError[] };

export function isWithinDesign(parameters: SchemeParameters): parameters is WithinOrdersParameters {
  return (WITHIN_DESIGNS as readonly string[]).includes(parameters.method);
}

export function totalWeight(conditions: readonly ConditionAllocation[]): number {
  return totalOfWeights(conditions.map((c) => c.weight));
}

/**
 * Checks raw input (e.g. a request body or a stored JSON column) and returns the normalized parameters
 * (defaults filled in, unknown fields refused) or every problem found, each naming its field.
 */
export function validateSchemeParameters(input: unknown): ValidationResult<SchemeParameters> {
  return checkSchemeParameters(input);
}

/** As validateSchemeParameters, but throws a RandomizationError listing the field errors. */
export function parseSchemeParameters(input: unknown): SchemeParameters {
  const result = validateSchemeParameters(input);
  if (!result.ok) throw new RandomizationError(RandomizationErrorCode.InvalidParameters, result.errors);
  return result.value;
}

/** Parses and also checks that the method is the one the caller needs. */
export function parseParametersOf<M extends SchemeMethod>(
  input: unknown,
  methods: readonly M[],
): Extract<SchemeParameters, { method: M }> {
  const parameters = parseSchemeParameters(input);
  if (!(methods as readonly string[]).includes(parameters.method)) {
    throw new RandomizationError(RandomizationErrorCode.InvalidParameters, [
      { field: 'method', message: `expected ${methods.join(' or ')}, got ${parameters.method}` },
    ]);
  }
  return parameters as Extract<SchemeParameters, { method: M }>;
}
