/** The middle value; the mean of the two middle values for an even count. */
export function median(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('median needs at least one value');
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

export interface ReportRow {
  label: string;
  /** The median of the samples. */
  value: number;
  /** Every round's value, in the order measured. */
  samples: number[];
  /** Compared with the baseline of its table; null on the baseline row itself. */
  ratio: number | null;
}

export interface ReportTable {
  title: string;
  unit: string;
  ratioHeading: string;
  rows: ReportRow[];
}

/** Summarizes rounds into a row: the median, the rounds themselves, and the median over the baseline's median. */
export function reportRow(label: string, samples: readonly number[], baseline?: readonly number[]): ReportRow {
  const value = median(samples);
  return { label, value, samples: [...samples], ratio: baseline ? value / median(baseline) : null };
}

const figure = (value: number) => (value >= 100 ? value.toFixed(0) : value >= 10 ? value.toFixed(1) : value.toFixed(2));

/** A plain fixed-width table: what was measured, its median, the ratio to the baseline, every round. */
export function formatTable(table: ReportTable): string {
  const header = ['measurement', `median ${table.unit}`, table.ratioHeading, 'rounds'];
  const body = table.rows.map((row) => [
    row.label,
    figure(row.value),
    row.ratio === null ? '–' : row.ratio.toFixed(3),
    row.samples.map(figure).join('  '),
  ]);
  const widths = header.map((cell, i) => Math.max(cell.length, ...body.map((cells) => cells[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((cell, i) => (i === 0 || i === 3 ? cell.padEnd(widths[i]) : cell.padStart(widths[i])))
      .join('  ')
      .trimEnd();
  return [table.title, line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...body.map(line)].join('\n');
}
