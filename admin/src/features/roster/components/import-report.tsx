import { Button } from '@/components/ui/button';
import { tableRecipe } from '@/components/ui/recipes';
import { Notice } from '@/components/ui/states';
import type { ImportResult } from '../api/import-roster';
import { importReportCsv } from '../utils/import-report-csv';
import { saveBlob } from '@/lib/save-blob';

/** Rows beyond this are in the downloadable report; a page of thousands of rows helps nobody. */
export const shownReportRows = 200;

function plural(count: number, one: string, many: string): string {
  return `${count} ${count === 1 ? one : many}`;
}

/** The api's answer to a roster import: who was added, who was already there, and every refused row. */
export function ImportReport({ result, fileName }: { result: ImportResult; fileName?: string }) {
  const headerProblems = result.errors.filter((error) => error.line === 1);
  const rowProblems = result.errors.filter((error) => error.line > 1);
  const refusedLines = new Set(rowProblems.map((error) => error.line)).size;
  const shown = result.errors.slice(0, shownReportRows);

  return (
    <div className="flex flex-col gap-3" aria-label="Import report" role="region">
      <ul className="grid gap-2 sm:grid-cols-3" aria-label="Import summary">
        <SummaryTile
          value={result.created}
          label={result.created === 1 ? 'person added' : 'people added'}
          tone="success"
        />
        <SummaryTile value={result.alreadyEnrolled} label="already on the roster, left as they were" />
        <SummaryTile
          value={refusedLines}
          label={refusedLines === 1 ? 'row refused' : 'rows refused'}
          tone={refusedLines > 0 ? 'danger' : undefined}
        />
      </ul>
      {result.ignoredColumns.length > 0 && (
        <Notice tone="info">
          {plural(result.ignoredColumns.length, 'column was', 'columns were')} not used:{' '}
          {result.ignoredColumns.map((column, index) => (
            <span key={column}>
              {index > 0 && ', '}
              <code className="font-mono text-xs">{column}</code>
            </span>
          ))}
          . Only e-mail, name and the study’s pretest columns are read.
        </Notice>
      )}
      {result.errors.length === 0 ? (
        <p className="text-sm text-success">Every row was read without a problem.</p>
      ) : (
        <>
          <div className="flex flex-wrap items-center justify-between gap-2">
            <p className="text-sm text-ink">
              {rowProblems.length > 0 &&
                `Fix ${refusedLines === 1 ? 'this row' : 'these rows'} in your file and import it again; rows already added are skipped. `}
              {headerProblems.length > 0 && `${plural(headerProblems.length, 'note', 'notes')} on the header row.`}
            </p>
            <Button
              size="compact"
              onClick={() =>
                saveBlob(
                  new Blob([importReportCsv(result.errors)], { type: 'text/csv' }),
                  `import-report${fileName ? `-${fileName.replace(/\.[^.]+$/, '')}` : ''}.csv`,
                )
              }
            >
              Download the report (CSV)
            </Button>
          </div>
          <div className={`${tableRecipe.frame} max-h-80 overflow-y-auto`}>
            <table className={tableRecipe.table}>
              <caption className="sr-only">Problems found, row by row</caption>
              <thead className="sticky top-0">
                <tr>
                  <th scope="col" className={`${tableRecipe.headCell} w-16`}>
                    Line
                  </th>
                  <th scope="col" className={`${tableRecipe.headCell} w-40`}>
                    Column
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    Problem
                  </th>
                </tr>
              </thead>
              <tbody>
                {shown.map((error, index) => (
                  <tr key={`${error.line}-${error.field}-${index}`} className={tableRecipe.row}>
                    <td className={`${tableRecipe.cell} tabular-nums`}>{error.line === 1 ? 'Header' : error.line}</td>
                    <td className={`${tableRecipe.cell} font-mono text-xs`}>{error.field}</td>
                    <td className={tableRecipe.cell}>{error.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {result.errors.length > shownReportRows && (
            <p className="text-xs text-ink-muted">
              Showing the first {shownReportRows} of {result.errors.length} problems; the downloaded report has them
              all.
            </p>
          )}
        </>
      )}
    </div>
  );
}

function SummaryTile({
  value,
  label,
  tone,
}: {
  value: number;
  label: string;
  tone?: 'success' | 'danger' | undefined;
}) {
  const color = tone === 'success' && value > 0 ? 'text-success' : tone === 'danger' ? 'text-danger' : 'text-ink';
  return (
    <li className="rounded-md border border-line bg-canvas px-3 py-2">
      <span className={`block text-2xl font-semibold tabular-nums ${color}`}>{value}</span>
      <span className="text-xs text-ink-muted">{label}</span>
    </li>
  );
}
