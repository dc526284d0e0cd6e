import { describe, expect, it } from 'vitest';
import { parseLines, parseNumberList, parseWholeNumberList } from './number-list';

describe('parseWholeNumberList', () => {
  it('reads commas, spaces and semicolons as separators', () => {
    expect(parseWholeNumberList('3, 6')).toEqual({ ok: true, values: [3, 6] });
    expect(parseWholeNumberList(' 4 8;12 ')).toEqual({ ok: true, values: [4, 8, 12] });
  });

  it('names the entry that is not a whole number of 1 or more', () => {
    expect(parseWholeNumberList('3, 4.5')).toEqual({ ok: false, message: '“4.5” is not a whole number of 1 or more.' });
    expect(parseWholeNumberList('0')).toEqual({ ok: false, message: '“0” is not a whole number of 1 or more.' });
    expect(parseWholeNumberList('')).toEqual({ ok: false, message: 'List at least one number.' });
  });
});

describe('parseNumberList', () => {
  it('allows decimals and negatives', () => {
    expect(parseNumberList('40, 65')).toEqual({ ok: true, values: [40, 65] });
    expect(parseNumberList('-1.5 .5 2.')).toEqual({ ok: true, values: [-1.5, 0.5, 2] });
    expect(parseNumberList('50%')).toEqual({ ok: false, message: '“50%” is not a number.' });
  });
});

describe('parseLines', () => {
  it('keeps one trimmed entry per non-empty line', () => {
    expect(parseLines(' north campus \n\nsouth campus\n')).toEqual(['north campus', 'south campus']);
  });
});
