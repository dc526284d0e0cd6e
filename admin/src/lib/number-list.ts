export type NumberListResult = { ok: true; values: number[] } | { ok: false; message: string };

function split(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((part) => part.trim())
    .filter((part) => part !== '');
}

/** Reads "3, 6" or "3 6" into [3, 6]; every entry must be a whole number of 1 or more. */
export function parseWholeNumberList(text: string): NumberListResult {
  const parts = split(text);
  if (parts.length === 0) return { ok: false, message: 'List at least one number.' };
  const values: number[] = [];
  for (const part of parts) {
    if (!/^\d+$/.test(part) || Number(part) < 1)
      return { ok: false, message: `“${part}” is not a whole number of 1 or more.` };
    values.push(Number(part));
  }
  return { ok: true, values };
}

/** Reads "40, 65" or "-1.5 2" into numbers (decimals and negatives allowed). */
export function parseNumberList(text: string): NumberListResult {
  const parts = split(text);
  if (parts.length === 0) return { ok: false, message: 'List at least one number.' };
  const values: number[] = [];
  for (const part of parts) {
    if (!/^-?(\d+(\.\d*)?|\.\d+)$/.test(part)) return { ok: false, message: `“${part}” is not a number.` };
    values.push(Number(part));
  }
  return { ok: true, values };
}

/** One entry per non-empty line, trimmed. */
export function parseLines(text: string): string[] {
  return text
    .split('\n')
    .map((line) => line.trim())
    .filter((line) => line !== '');
}
