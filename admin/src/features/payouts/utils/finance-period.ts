export interface Period {
  from: string;
  to: string;
}

const day = (date: Date) => date.toISOString().slice(0, 10);

/** From the first of this month (UTC) to today. */
export function thisMonth(now: Date): Period {
  return { from: day(new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), 1))), to: day(now) };
}

const realDay = (value: string) => /^\d{4}-\d{2}-\d{2}$/.test(value) && day(new Date(`${value}T00:00:00Z`)) === value;

/** The same rules the api applies, checked before asking it: real days, in order, at most a year apart. */
export function periodProblems({ from, to }: Period): { from?: string; to?: string } {
  const problems: { from?: string; to?: string } = {};
  if (!realDay(from)) problems.from = 'Choose the first day of the period.';
  if (!realDay(to)) problems.to = 'Choose the last day of the period.';
  if (problems.from || problems.to) return problems;
  if (to < from) problems.to = 'The last day must be on or after the first day.';
  else if (Date.parse(to) - Date.parse(from) > 366 * 86_400_000) problems.to = 'Choose a period of at most a year.';
  return problems;
}
