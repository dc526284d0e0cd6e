import { describe, expect, it } from 'vitest';
import { screeningQuestions } from '@/test/participant-fixtures';
import {
  numberRangeHint,
  screeningDefaultValues,
  screeningFieldForApiField,
  screeningFormSchema,
} from './screening-schema';

const schema = screeningFormSchema(screeningQuestions);

function messagesFor(values: Record<string, string>) {
  const result = schema.safeParse(values);
  if (result.success) return {};
  // One message per question, the first, as the form shows it.
  const messages: Record<string, string> = {};
  for (const issue of result.error.issues) messages[issue.path.join('.')] ??= issue.message;
  return messages;
}

describe('screening schema built from the questions', () => {
  it('turns the form text into the answers the api expects, keyed by question', () => {
    expect(schema.parse({ q0: 'yes', q1: ' 5 ', q2: 'Public transport' })).toEqual({
      answers: { adult: true, sense_of_direction: 5, commute: 'Public transport' },
    });
    expect(schema.parse({ q0: 'no', q1: '6,5', q2: 'Car' }).answers).toEqual({
      adult: false,
      sense_of_direction: 6.5,
      commute: 'Car',
    });
  });

  it('asks for every unanswered question in its own words', () => {
    expect(messagesFor({ q0: '', q1: '', q2: '' })).toEqual({
      q0: 'Please choose Yes or No.',
      q1: 'Please enter a number.',
      q2: 'Please choose one of the answers.',
    });
  });

  it("keeps a number within the question's own range", () => {
    expect(messagesFor({ q0: 'yes', q1: '0', q2: 'Car' })).toEqual({ q1: 'Please enter a number from 1 to 7.' });
    expect(messagesFor({ q0: 'yes', q1: '8', q2: 'Car' })).toEqual({ q1: 'Please enter a number from 1 to 7.' });
    expect(messagesFor({ q0: 'yes', q1: '1', q2: 'Car' })).toEqual({});
    expect(messagesFor({ q0: 'yes', q1: '7', q2: 'Car' })).toEqual({});
  });

  it('refuses text that is not a number, and an answer that is not one of the options', () => {
    expect(messagesFor({ q0: 'yes', q1: 'five', q2: 'Skateboard' })).toEqual({
      q1: 'Please enter a number, using digits only (for example 25).',
      q2: 'Please choose one of the answers.',
    });
  });

  it('words a range with only one end', () => {
    const ageOnly = screeningFormSchema([
      { key: 'age', label: 'Your age', kind: 'number', min: 18, purpose: 'eligibility' },
    ]);
    expect(ageOnly.safeParse({ q0: '17' }).error?.issues[0]?.message).toBe('Please enter a number of 18 or more.');
    expect(numberRangeHint({ key: 'age', label: 'Your age', kind: 'number', min: 18, purpose: 'eligibility' })).toBe(
      'A number of 18 or more',
    );
    expect(numberRangeHint({ key: 'n', label: 'Any', kind: 'number', purpose: 'stratification' })).toBeNull();
  });
});

describe('earlier answers and api field errors', () => {
  it('fills the form from earlier answers and leaves unknown ones empty', () => {
    expect(screeningDefaultValues(screeningQuestions, { adult: false, sense_of_direction: 3 })).toEqual({
      q0: 'no',
      q1: '3',
      q2: '',
    });
    expect(screeningDefaultValues(screeningQuestions, null)).toEqual({ q0: '', q1: '', q2: '' });
  });

  it('finds the field for an api error on "answers.<key>"', () => {
    expect(screeningFieldForApiField(screeningQuestions, 'answers.commute')).toBe('q2');
    expect(screeningFieldForApiField(screeningQuestions, 'answers.unknown')).toBeNull();
  });
});
