import type { FieldError } from '../common/errors/error-codes';

export type Answer = number | string | boolean;

export interface EligibilityQuestion {
  key: string;
  label: string;
  kind: 'yes-no' | 'number' | 'choice';
  options: string[] | null;
  minValue: number | null;
  maxValue: number | null;
  criterion: string | null;
  eligibleValues: Array<string | boolean> | null;
  eligibleMin: number | null;
  eligibleMax: number | null;
}

export interface StratificationQuestion {
  key: string;
  label: string;
  kind: 'numeric' | 'categorical';
  categories: string[] | null;
}

export interface ScreeningOutcome {
  errors: FieldError[];
  eligible: boolean;
  /** Plain-language reasons, one per unmet criterion. */
  reasons: string[];
  /** The stratification answers, as the assignment engine reads them. */
  covariates: Record<string, number | string>;
  answers: Record<string, Answer>;
}

function describeRule(question: EligibilityQuestion): string {
  if (question.criterion) return question.criterion;
  if (question.kind === 'number') {
    if (question.eligibleMin !== null && question.eligibleMax !== null)
      return `${question.label}: between ${question.eligibleMin} and ${question.eligibleMax}`;
    if (question.eligibleMin !== null) return `${question.label}: at least ${question.eligibleMin}`;
    if (question.eligibleMax !== null) return `${question.label}: at most ${question.eligibleMax}`;
  }
  return question.label;
}

/** The allowed answers of a number question, as the person should be told them. */
export function numberRangeWords(min: number | null, max: number | null): string {
  if (min !== null && max !== null) return `enter a number from ${min} to ${max}`;
  if (min !== null) return `enter a number of ${min} or more`;
  return `enter a number of ${max} or less`;
}

/**
 * The headline of a refused set of answers, naming each question by its label (`Sense of direction: enter a number
 * from 0 to 100.`); the field errors keep the keys for the form.
 */
export function screeningProblemMessage(errors: FieldError[], labels: Record<string, string>): string {
  const named = errors.map((error) => {
    const key = error.field.replace(/^answers\./, '');
    return `${labels[key] ?? key}: ${error.message}`;
  });
  if (named.length === 1) return `${named[0]}.`;
  return `Some answers need attention. ${named.join('; ')}.`;
}

/**
 * Checks every answer against its question (a missing or malformed answer is a field error) and then against the
 * eligibility rules. Stratification answers never exclude anyone; they are only checked for form.
 */
export function evaluateScreening(
  eligibility: EligibilityQuestion[],
  stratification: StratificationQuestion[],
  raw: Record<string, unknown>,
): ScreeningOutcome {
  const errors: FieldError[] = [];
  const answers: Record<string, Answer> = {};
  const reasons: string[] = [];
  const covariates: Record<string, number | string> = {};
  const known = new Set([...eligibility.map((q) => q.key), ...stratification.map((q) => q.key)]);
  for (const key of Object.keys(raw)) {
    if (!known.has(key)) errors.push({ field: `answers.${key}`, message: 'is not a question of this study' });
  }

  for (const question of eligibility) {
    const field = `answers.${question.key}`;
    const value = raw[question.key];
    if (value === undefined || value === null || value === '') {
      errors.push({ field, message: 'please answer this question' });
      continue;
    }
    if (question.kind === 'yes-no') {
      if (typeof value !== 'boolean') {
        errors.push({ field, message: 'must be yes or no' });
        continue;
      }
      answers[question.key] = value;
      if (question.eligibleValues && !question.eligibleValues.includes(value)) reasons.push(describeRule(question));
    } else if (question.kind === 'number') {
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        errors.push({ field, message: 'must be a number' });
        continue;
      }
      if (
        (question.minValue !== null && value < question.minValue) ||
        (question.maxValue !== null && value > question.maxValue)
      ) {
        errors.push({ field, message: numberRangeWords(question.minValue, question.maxValue) });
        continue;
      }
      answers[question.key] = value;
      if (
        (question.eligibleMin !== null && value < question.eligibleMin) ||
        (question.eligibleMax !== null && value > question.eligibleMax)
      ) {
        reasons.push(describeRule(question));
      }
    } else {
      if (typeof value !== 'string' || !(question.options ?? []).includes(value)) {
        errors.push({ field, message: `must be one of: ${(question.options ?? []).join(', ')}` });
        continue;
      }
      answers[question.key] = value;
      if (question.eligibleValues && !question.eligibleValues.includes(value)) reasons.push(describeRule(question));
    }
  }

  for (const factor of stratification) {
    const field = `answers.${factor.key}`;
    const value = raw[factor.key];
    if (value === undefined || value === null || value === '') {
      errors.push({ field, message: 'please answer this question' });
    } else if (factor.kind === 'numeric') {
      if (typeof value !== 'number' || !Number.isFinite(value)) errors.push({ field, message: 'must be a number' });
      else covariates[factor.key] = answers[factor.key] = value;
    } else if (typeof value !== 'string' || !(factor.categories ?? []).includes(value)) {
      errors.push({ field, message: `must be one of: ${(factor.categories ?? []).join(', ')}` });
    } else {
      covariates[factor.key] = answers[factor.key] = value;
    }
  }

  return { errors, eligible: errors.length === 0 && reasons.length === 0, reasons, covariates, answers };
}
