// Participant references pasted one per line, or read from the first column of a text or CSV file. Pure.

const headerCell = /^(participant[ _-]?)?ref(erence)?s?$/i;

/** The first cell of a CSV, semicolon- or tab-separated line, without surrounding quotes ("" inside quotes is one "). */
export function firstCell(line: string): string {
  const text = line.trim();
  if (text.startsWith('"')) {
    let cell = '';
    for (let i = 1; i < text.length; i += 1) {
      const char = text[i];
      if (char === '"') {
        if (text[i + 1] === '"') {
          cell += '"';
          i += 1;
        } else {
          return cell.trim();
        }
      } else {
        cell += char;
      }
    }
    return cell.trim();
  }
  return (text.split(/[,;\t]/)[0] ?? '').trim();
}

/**
 * One reference per non-empty line, in the order given: the first cell of each line, a header row such as
 * "reference" dropped. Duplicates are kept so the api's row report can say which line repeats which.
 */
export function parseReferenceList(text: string): string[] {
  const cells = text
    .replace(/^\uFEFF/, '')
    .split(/\r\n|\r|\n/)
    .map(firstCell)
    .filter((cell) => cell !== '');
  if (cells.length > 0 && headerCell.test(cells[0] ?? '')) cells.shift();
  return cells;
}
