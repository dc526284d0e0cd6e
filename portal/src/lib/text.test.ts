import { describe, expect, it } from 'vitest';
import { asSentence, minutesInWords, paragraphsOf } from './text';

describe('paragraphs of plain text', () => {
  it('splits on blank lines (also with Windows line ends and stray spaces) and drops empty ones', () => {
    expect(paragraphsOf('First part.\r\n\r\nSecond part,\nstill second.\n  \n\n\nThird.\n')).toEqual([
      'First part.',
      'Second part,\nstill second.',
      'Third.',
    ]);
  });

  it('gives nothing for empty text', () => {
    expect(paragraphsOf('  \n\n ')).toEqual([]);
  });
});

describe('minutes in words', () => {
  it.each([
    [1, '1 minute'],
    [45, '45 minutes'],
    [60, '1 hour'],
    [61, '1 hour 1 minute'],
    [150, '2 hours 30 minutes'],
  ])('%i reads "%s"', (minutes, words) => {
    expect(minutesInWords(minutes)).toBe(words);
  });
});

describe('an api field message as a sentence', () => {
  it.each([
    ['does not match; check it and try again', 'Does not match; check it and try again.'],
    ['  please answer this question ', 'Please answer this question.'],
    ['Is it you?', 'Is it you?'],
  ])('"%s" reads "%s"', (message, sentence) => {
    expect(asSentence(message)).toBe(sentence);
  });
});
