import { Badge, type BadgeTone } from '@/components/ui/badge';
import { tableRecipe } from '@/components/ui/recipes';
import type { BulkCompletionResult, BulkCompletionRow } from '../api/complete-step-list';

/** Rows beyond this are summarised; a page of thousands of rows helps nobody. */
export const shownCompletionRows = 300;

const outcomeWording: Record<BulkCompletionRow['outcome'], { label: string; tone: BadgeTone }> = {
  completed: { label: 'Marked done', tone: 'success' },
  'already-done': { label: 'Already done', tone: 'neutral' },
  failed: { label: 'Not marked', tone: 'danger' },
};

/** The api's answer to a list: one row per line, with what happened and why a line failed. */
export function BulkCompletionReport({ result, stepTitle }: { result: BulkCompletionResult; stepTitle: string }) {
  // Failed lines first: they are the ones to act on.
  const rows = [...result.rows].sort(
    (a, b) => Number(b.outcome === 'failed') - Number(a.outcome === 'failed') || a.line - b.line,
  );
  const shown = rows.slice(0, shownCompletionRows);
  return (
    <div className="flex flex-col gap-3" role="region" aria-label="Completion report">
      <p className="text-sm">
        <span className="font-semibold">{stepTitle}</span>
      </p>
      <ul className="grid gap-2 sm:grid-cols-3" aria-label="Completion summary">
        <Tile
          value={result.completed}
          label="marked done now"
          className={result.completed > 0 ? 'text-success' : 'text-ink'}
        />
        <Tile value={result.alreadyDone} label="already done, left as they were" className="text-ink" />
        <Tile
          value={result.failed}
          label={result.failed === 1 ? 'line not marked' : 'lines not marked'}
          className={result.failed > 0 ? 'text-danger' : 'text-ink'}
        />
      </ul>
      {result.failed > 0 ? (
        <p className="text-sm">
          Lines that failed wrote nothing. Fix them and send just those lines again; lines already done are skipped.
        </p>
      ) : (
        <p className="text-sm text-success">Every line went through.</p>
      )}
      <div className={`${tableRecipe.frame} max-h-80 overflow-y-auto`}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Each line of the list and what happened to it, failed lines first</caption>
          <thead className="sticky top-0">
            <tr>
              <th scope="col" className={`${tableRecipe.headCell} w-14`}>
                Line
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                Reference
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                Result
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                Why
              </th>
            </tr>
          </thead>
          <tbody>
            {shown.map((row) => (
              <tr key={row.line} className={tableRecipe.row}>
                <td className={`${tableRecipe.cell} tabular-nums`}>{row.line}</td>
                <td className={`${tableRecipe.cell} font-mono text-xs break-all`}>{row.reference || '—'}</td>
                <td className={`${tableRecipe.cell} whitespace-nowrap`}>
                  <Badge tone={outcomeWording[row.outcome].tone}>{outcomeWording[row.outcome].label}</Badge>
                </td>
                <td className={tableRecipe.cell}>{row.message ?? ''}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {rows.length > shownCompletionRows && (
        <p className="text-xs text-ink-muted">
          Showing {shownCompletionRows} of {rows.length} lines, failed lines first; the rest were marked done or already
          done.
        </p>
      )}
    </div>
  );
}

function Tile({ value, label, className }: { value: number; label: string; className: string }) {
  return (
    <li className="rounded-md border border-line bg-canvas px-3 py-2">
      <span className={`block text-2xl font-semibold tabular-nums ${className}`}>{value}</span>
      <span className="text-xs text-ink-muted">{label}</span>
    </li>
  );
}
