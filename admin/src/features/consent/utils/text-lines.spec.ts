import { describe, expect, it } from 'vitest';
import { lineRange } from './text-lines';

// Reference: the api numbers lines as `source.replace(/\r\n?/g, '\n').split('\n')` (required-elements-check.ts);
// String.prototype.split is the outside reference the offsets are compared with.
function referenceLine(text: string, line: number): string {
  return text.replace(/\r\n?/g, '\n').split('\n')[line - 1] ?? '';
}

describe('lineRange', () => {
  const form = '# Consent\n\n## Key information\n[to fill: institution]\nLast line';

  it.each([1, 2, 3, 4, 5])('finds line %i as String.split numbers it', (line) => {
    const { start, end } = lineRange(form, line);
    expect(form.slice(start, end)).toBe(referenceLine(form, line));
  });

  it('counts CR LF and lone CR as one line break each', () => {
    const text = 'first\r\nsecond\rthird\nfourth';
    for (const line of [1, 2, 3, 4]) {
      const { start, end } = lineRange(text, line);
      expect(text.slice(start, end)).toBe(referenceLine(text, line));
    }
  });

  it('puts a line past the end on the last line and refuses line 0', () => {
    expect(lineRange('one\ntwo', 9)).toEqual({ start: 4, end: 7 });
    expect(() => lineRange('one', 0)).toThrow('line must be a whole number from 1, got 0');
  });
});
