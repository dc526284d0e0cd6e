/** The api's limit for a roster upload (MAX_ROSTER_BYTES in api/src/enrollments/enrollments.controller.ts). */
export const maxRosterBytes = 5 * 1024 * 1024;

const csvTypes = [
  'text/csv',
  'application/csv',
  'text/comma-separated-values',
  'application/vnd.ms-excel',
  'text/plain',
  '',
];

/** Why this file cannot be a roster, or null when it may be sent. The api checks again and reports every row. */
export function rosterFileProblem(file: { name: string; size: number; type: string }): string | null {
  if (!/\.(csv|txt)$/i.test(file.name) || !csvTypes.includes(file.type)) {
    return `${file.name} is not a CSV file. Save the spreadsheet as “CSV (comma separated)” and choose that file.`;
  }
  if (file.size === 0) return `${file.name} is empty.`;
  if (file.size > maxRosterBytes)
    return `${file.name} is larger than 5 MB, the most one import takes. Split it into smaller files.`;
  return null;
}

/** Whole percent done, never above 100 and 0 when the size is unknown. */
export function percentDone(loaded: number, total: number): number {
  if (!(total > 0)) return 0;
  return Math.min(100, Math.max(0, Math.floor((loaded / total) * 100)));
}
