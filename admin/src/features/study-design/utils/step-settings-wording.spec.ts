import { describe, expect, it } from 'vitest';
import { windowSentence } from './step-settings-wording';

describe('windowSentence', () => {
  it('counts from assignment or from the previous step, in singular and plural', () => {
    expect(windowSentence({ opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: null })).toBe(
      'Opens at assignment · no due date',
    );
    expect(windowSentence({ opensAfterDays: 1, opensFrom: 'previous-step', dueWithinDays: 3 })).toBe(
      'Opens 1 day after the previous step is done · due within 3 days',
    );
    expect(windowSentence({ opensAfterDays: 7, opensFrom: 'assignment', dueWithinDays: 1 })).toBe(
      'Opens 7 days after assignment · due within 1 day',
    );
  });

  it('says a step due within 0 days is due the day it opens', () => {
    expect(windowSentence({ opensAfterDays: 2, opensFrom: 'previous-step', dueWithinDays: 0 })).toBe(
      'Opens 2 days after the previous step is done · due the day it opens',
    );
  });
});
