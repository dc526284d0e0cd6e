import { describe, expect, it } from 'vitest';
import { wrapBoxText } from './wrap-box-text';

describe('wrapBoxText', () => {
  it('breaks between words within the width', () => {
    expect(wrapBoxText('Allocated to audio cues', 12)).toEqual(['Allocated to', 'audio cues']);
  });

  it('keeps a count "(n = 1)" together on one line', () => {
    expect(wrapBoxText('Randomized (n = 1)', 14)).toEqual(['Randomized', '(n = 1)']);
    expect(wrapBoxText('No reply to reminders (n = 12)', 25)).toEqual(['No reply to reminders', '(n = 12)']);
    for (let width = 8; width < 40; width++)
      for (const line of wrapBoxText('Excluded before randomization (n = 3) · Lost (n = 1)', width))
        expect(line, `width ${width}`).not.toMatch(/\(n =$|^\d+\)/);
  });
});
