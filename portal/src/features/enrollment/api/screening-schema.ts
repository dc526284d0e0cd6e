import { z } from 'zod';
import type { ScreeningQuestion } from './get-my-enrollment';

export type ScreeningAnswer = number | string | boolean;

/**
 * Form fields are named by position (`q0`, `q1`, …), not by question key: a key may hold a dot or a bracket,
 * which react-hook-form would read as a path. Every field holds text while it is being edited.
 */
export const screeningFieldName = (index: number) => `q${index}`;

export type ScreeningFormValues = Record<string, string>;
export type ScreeningRequest = { answers: Record<string, ScreeningAnswer> };

function isDecimalNumber(text: string): boolean {
  return /^[-+]?(\d+([.,]\d*)?|[.,]\d+)$/.test(text);
}

function rangeWords(min: number | undefined, max: number | undefined): string | null {
  if (min !== undefined && max !== undefined) return `from ${min} to ${max}`;
  if (min !== undefined) return `of ${min} or more`;
  if (max !== undefined) return `of ${max} or less`;
  return null;
}

/** "A number from 1 to 7", for the hint under a number question; null when any number will do. */
export function numberRangeHint(question: ScreeningQuestion): string | null {
  const range = rangeWords(question.min, question.max);
  return range ? `A number ${range}` : null;
}

/** What to ask for when an answer is not right, in the question's own terms (also used for the api's refusals). */
export function answerProblemInWords(question: ScreeningQuestion): string {
  switch (question.kind) {
    case 'yes-no':
      return 'Please choose Yes or No.';
    case 'number': {
      const range = rangeWords(question.min, question.max);
      return range ? `Please enter a number ${range}.` : 'Please enter a number.';
    }
    case 'choice':
      return 'Please choose one of the answers.';
  }
}

function answerSchema(question: ScreeningQuestion) {
  switch (question.kind) {
    case 'yes-no':
      return z
        .string()
        .refine((value) => value === 'yes' || value === 'no', 'Please choose Yes or No.')
        .transform((value) => value === 'yes');
    case 'number': {
      const range = rangeWords(question.min, question.max);
      const outOfRange = `Please enter a number ${range}.`;
      return z
        .string()
        .trim()
        .min(1, { error: 'Please enter a number.', abort: true })
        .refine(isDecimalNumber, 'Please enter a number, using digits only (for example 25).')
        .transform((text) => Number(text.replace(',', '.')))
        .pipe(
          z
            .number()
            .min(question.min ?? Number.NEGATIVE_INFINITY, outOfRange)
            .max(question.max ?? Number.POSITIVE_INFINITY, outOfRange),
        );
    }
    case 'choice': {
      const options = question.options ?? [];
      return z.string().refine((value) => options.includes(value), 'Please choose one of the answers.');
    }
  }
}

/** The form's schema, built from the study's questions: checks each answer and turns the form into the request body. */
export function screeningFormSchema(questions: ScreeningQuestion[]) {
  const shape = Object.fromEntries(
    questions.map((question, index) => [screeningFieldName(index), answerSchema(question)]),
  );
  return z.object(shape).transform((values): ScreeningRequest => ({
    answers: Object.fromEntries(
      questions.map((question, index) => [question.key, values[screeningFieldName(index)] as ScreeningAnswer]),
    ),
  }));
}

/** Earlier answers (or none) as form text. */
export function screeningDefaultValues(
  questions: ScreeningQuestion[],
  answers: Record<string, unknown> | null,
): ScreeningFormValues {
  return Object.fromEntries(
    questions.map((question, index) => [screeningFieldName(index), answerAsText(answers?.[question.key])]),
  );
}

function answerAsText(answer: unknown): string {
  if (typeof answer === 'boolean') return answer ? 'yes' : 'no';
  if (typeof answer === 'number' || typeof answer === 'string') return String(answer);
  return '';
}

/** The form field an api field error ("answers.<key>") belongs to, if any. */
export function screeningFieldForApiField(questions: ScreeningQuestion[], apiField: string): string | null {
  const index = questions.findIndex((question) => `answers.${question.key}` === apiField);
  return index === -1 ? null : screeningFieldName(index);
}
