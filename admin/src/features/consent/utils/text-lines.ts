/**
 * Where a 1-based line starts and ends in a text, counting lines the way the api's check does
 * (CR LF, CR and LF all end a line). Lines past the end land on the last line.
 */
export function lineRange(text: string, line: number): { start: number; end: number } {
  if (!Number.isInteger(line) || line < 1) throw new RangeError(`line must be a whole number from 1, got ${line}`);
  let start = 0;
  for (let current = 1; current < line; current += 1) {
    const next = nextLineStart(text, start);
    if (next === null) break;
    start = next;
  }
  const breakAt = text.slice(start).search(/\r\n?|\n/);
  return { start, end: breakAt < 0 ? text.length : start + breakAt };
}

function nextLineStart(text: string, from: number): number | null {
  const match = /\r\n?|\n/.exec(text.slice(from));
  return match ? from + match.index + match[0].length : null;
}
