import { ValidationException } from '../common/errors/domain.exception';
import type { FieldError } from '../common/errors/error-codes';

interface FactorDefinition {
  key: string;
  kind: 'numeric' | 'categorical';
  cutPoints?: number[];
  categories?: string[];
}

/** Checks a whole list of factors; every problem is reported with the index of the factor it belongs to. */
export function checkFactorDefinitions(factors: FactorDefinition[]): void {
  const errors: FieldError[] = [];
  const seen = new Set<string>();
  factors.forEach((factor, i) => {
    const at = `factors.${i}`;
    if (seen.has(factor.key)) errors.push({ field: `${at}.key`, message: `"${factor.key}" is used by another factor` });
    seen.add(factor.key);
    if (factor.kind === 'numeric') {
      const cuts = factor.cutPoints ?? [];
      if (cuts.length === 0)
        errors.push({ field: `${at}.cutPoints`, message: 'a numeric factor needs at least one cut point' });
      if (cuts.some((c, j) => j > 0 && c <= cuts[j - 1]))
        errors.push({ field: `${at}.cutPoints`, message: 'must be strictly increasing' });
      if (factor.categories) errors.push({ field: `${at}.categories`, message: 'is only for categorical factors' });
    } else {
      const categories = (factor.categories ?? []).map((c) => c.trim());
      if (categories.length < 2)
        errors.push({ field: `${at}.categories`, message: 'a categorical factor needs at least two categories' });
      if (new Set(categories).size !== categories.length)
        errors.push({ field: `${at}.categories`, message: 'must not repeat a category' });
      if (categories.some((c) => c === ''))
        errors.push({ field: `${at}.categories`, message: 'must not contain an empty category' });
      if (factor.cutPoints) errors.push({ field: `${at}.cutPoints`, message: 'is only for numeric factors' });
    }
  });
  if (errors.length > 0) throw new ValidationException(errors);
}

interface ScreeningQuestionDefinition {
  key: string;
  kind: 'yes-no' | 'number' | 'choice';
  options?: string[];
  minValue?: number;
  maxValue?: number;
  eligibleValues?: Array<string | boolean>;
  eligibleMin?: number;
  eligibleMax?: number;
}

/** Checks eligibility questions: each rule must be answerable with the question's own kind of answer. */
export function checkScreeningQuestions(questions: ScreeningQuestionDefinition[]): void {
  const errors: FieldError[] = [];
  const seen = new Set<string>();
  questions.forEach((q, i) => {
    const at = `questions.${i}`;
    if (seen.has(q.key)) errors.push({ field: `${at}.key`, message: `"${q.key}" is used by another question` });
    seen.add(q.key);
    if (q.kind === 'choice' && (q.options ?? []).length < 2)
      errors.push({ field: `${at}.options`, message: 'a choice needs at least two options' });
    if (q.kind === 'yes-no' && q.eligibleValues?.some((v) => typeof v !== 'boolean')) {
      errors.push({ field: `${at}.eligibleValues`, message: 'a yes-no question accepts true or false' });
    }
    if (q.kind === 'choice' && q.eligibleValues?.some((v) => typeof v !== 'string' || !(q.options ?? []).includes(v))) {
      errors.push({ field: `${at}.eligibleValues`, message: 'must be some of the options' });
    }
    if (q.kind !== 'number' && (q.eligibleMin !== undefined || q.eligibleMax !== undefined)) {
      errors.push({ field: `${at}.eligibleMin`, message: 'a range applies to number questions only' });
    }
    if (q.minValue !== undefined && q.maxValue !== undefined && q.minValue > q.maxValue) {
      errors.push({ field: `${at}.maxValue`, message: 'must not be below minValue' });
    }
  });
  if (errors.length > 0) throw new ValidationException(errors);
}
