import { AttritionInputError, proportion, requireAtMost, requireCount } from './attrition-input-error';

/** Randomized participants and how many of them are not in the analysed group, for one condition or a pool of them. */
export interface AttritionCount {
  randomized: number;
  attrited: number;
}

function checkCount(count: AttritionCount, field: string): void {
  requireCount(count.randomized, `${field}.randomized`);
  requireCount(count.attrited, `${field}.attrited`);
  requireAtMost(count.attrited, count.randomized, `${field}.attrited`, 'randomized');
}

export function attritionRate(count: AttritionCount, field = 'condition'): number | null {
  checkCount(count, field);
  return proportion(count.attrited, count.randomized);
}

// Overall attrition, WWC Procedures and Standards Handbook v4.1: pooled over the conditions, (Σ randomized − Σ analysed) / Σ randomized.
export function overallAttrition(counts: readonly AttritionCount[], field = 'conditions'): number | null {
  counts.forEach((count, index) => checkCount(count, `${field}[${index}]`));
  const randomized = counts.reduce((total, count) => total + count.randomized, 0);
  const attrited = counts.reduce((total, count) => total + count.attrited, 0);
  return proportion(attrited, randomized);
}

// Differential attrition, WWC Procedures and Standards Handbook v4.1: largest minus smallest condition rate (|a − b| for two).
export function differentialAttrition(counts: readonly AttritionCount[], field = 'conditions'): number | null {
  const rates = counts
    .map((count, index) => attritionRate(count, `${field}[${index}]`))
    .filter((rate): rate is number => rate !== null);
  if (rates.length < 2) return null;
  return Math.max(...rates) - Math.min(...rates);
}

export function requireConditionIds(ids: readonly string[], field: string): void {
  const seen = new Set<string>();
  ids.forEach((id, index) => {
    if (typeof id !== 'string' || id === '')
      throw new AttritionInputError(`${field}[${index}].conditionId`, 'must be a non-empty string');
    if (seen.has(id)) throw new AttritionInputError(`${field}[${index}].conditionId`, `"${id}" appears more than once`);
    seen.add(id);
  });
}
