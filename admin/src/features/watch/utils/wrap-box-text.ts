/**
 * Splits a flow-diagram box's text into lines of at most `maxChars` characters, breaking only between words.
 * A count such as "(n = 12)" is one word, so it never wraps as "(n =" / "12)".
 */
export function wrapBoxText(text: string, maxChars: number): string[] {
  const lines: string[] = [];
  let line = '';
  const words = text.match(/\(n = \d+\)|\S+/g) ?? [];
  for (const word of words) {
    if (line && (line + ' ' + word).length > maxChars) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines;
}
