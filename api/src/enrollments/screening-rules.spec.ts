import { describe, expect, it } from 'vitest';
import {
  EligibilityQuestion,
  evaluateScreening,
  numberRangeWords,
  screeningProblemMessage,
  StratificationQuestion,
} from './screening-rules';

const adult: EligibilityQuestion = {
  key: 'adult',
  label: 'Are you 18 or older?',
  kind: 'yes-no',
  options: null,
  minValue: null,
  maxValue: null,
  criterion: '18 or older',
  eligibleValues: [true],
  eligibleMin: null,
  eligibleMax: null,
};
const hours: EligibilityQuestion = {
  ...adult,
  key: 'screen_hours',
  label: 'Hours a day at a screen',
  kind: 'number',
  criterion: null,
  eligibleValues: null,
  minValue: 0,
  maxValue: 24,
  eligibleMin: 1,
  eligibleMax: null,
};
const pretest: StratificationQuestion = {
  key: 'sense_of_direction',
  label: 'Sense of direction',
  kind: 'numeric',
  categories: null,
};
const site: StratificationQuestion = {
  key: 'site',
  label: 'Where',
  kind: 'categorical',
  categories: ['lab', 'online'],
};

describe('evaluateScreening', () => {
  it('accepts an eligible person and returns the stratification answers as covariates', () => {
    const outcome = evaluateScreening([adult, hours], [pretest, site], {
      adult: true,
      screen_hours: 3,
      sense_of_direction: 72,
      site: 'online',
    });
    expect(outcome).toMatchObject({
      errors: [],
      eligible: true,
      reasons: [],
      covariates: { sense_of_direction: 72, site: 'online' },
    });
  });

  it('excludes with a reason per unmet criterion, never because of a stratification answer', () => {
    const outcome = evaluateScreening([adult, hours], [pretest], {
      adult: false,
      screen_hours: 0,
      sense_of_direction: 5,
    });
    expect(outcome.eligible).toBe(false);
    expect(outcome.errors).toEqual([]);
    expect(outcome.reasons).toEqual(['18 or older', 'Hours a day at a screen: at least 1']);
  });

  it('names each missing, malformed, out-of-range or unknown answer', () => {
    const outcome = evaluateScreening([adult, hours], [pretest, site], {
      adult: 'yes',
      screen_hours: 30,
      site: 'moon',
      shoe_size: 9,
    });
    expect(outcome.errors.map((e) => e.field).sort()).toEqual(
      [
        'answers.adult',
        'answers.screen_hours',
        'answers.sense_of_direction',
        'answers.shoe_size',
        'answers.site',
      ].sort(),
    );
    expect(outcome.eligible).toBe(false);
  });
});

describe('plain words for an answer out of range', () => {
  it('says the allowed numbers on the field and names the question in the headline', () => {
    const outcome = evaluateScreening([adult, hours], [], { adult: true, screen_hours: 30 });
    expect(outcome.errors).toEqual([{ field: 'answers.screen_hours', message: 'enter a number from 0 to 24' }]);
    expect(screeningProblemMessage(outcome.errors, { screen_hours: 'Hours a day at a screen' })).toBe(
      'Hours a day at a screen: enter a number from 0 to 24.',
    );
  });

  it('words one-sided ranges and several problems', () => {
    expect(numberRangeWords(0, null)).toBe('enter a number of 0 or more');
    expect(numberRangeWords(null, 7)).toBe('enter a number of 7 or less');
    expect(
      screeningProblemMessage(
        [
          { field: 'answers.adult', message: 'please answer this question' },
          { field: 'answers.site', message: 'must be one of: lab, online' },
        ],
        { adult: 'Are you 18 or older?', site: 'Where' },
      ),
    ).toBe(
      'Some answers need attention. Are you 18 or older?: please answer this question; Where: must be one of: lab, online.',
    );
  });
});
