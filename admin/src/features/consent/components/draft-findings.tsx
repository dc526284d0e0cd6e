import { Badge } from '@/components/ui/badge';
import { cx } from '@/components/ui/cx';
import type { ConsentCheck, ConsentFinding } from '../api/check-consent-version';

export interface DraftFindingsProps {
  check: ConsentCheck;
  /** The text changed after this check ran, so lines may have moved. */
  stale?: boolean;
  /** Moves the caret to a line of the form text; findings with a line become buttons. */
  onJumpToLine?: (line: number) => void;
}

interface ElementPresence {
  id: string;
  citation: string;
  name: string;
  present: boolean;
}

// The check's `required` list is typed loosely in the OpenAPI document; read only what this screen shows.
function elementPresences(items: readonly Record<string, unknown>[]): ElementPresence[] {
  return items.flatMap((item) =>
    typeof item.id === 'string' &&
    typeof item.citation === 'string' &&
    typeof item.name === 'string' &&
    typeof item.present === 'boolean'
      ? [{ id: item.id, citation: item.citation, name: item.name, present: item.present }]
      : [],
  );
}

function summary(findings: readonly ConsentFinding[]): string {
  const elements = findings.filter((finding) => finding.element !== null).length;
  const placeholders = findings.length - elements;
  const parts = [
    elements > 0 && `${elements} ${elements === 1 ? 'problem' : 'problems'} with required elements`,
    placeholders > 0 && `${placeholders} ${placeholders === 1 ? 'placeholder' : 'placeholders'} still to fill`,
  ].filter(Boolean);
  return `${parts.join(' and ')}. Fix ${findings.length === 1 ? 'it' : 'them'} before activation.`;
}

export function DraftFindings({ check, stale = false, onJumpToLine }: DraftFindingsProps) {
  const presences = elementPresences(check.required);
  return (
    <div className="flex flex-col gap-3">
      {stale && (
        <p className="text-xs font-medium text-caution">
          The text has changed since this check. Save and run it again to be sure.
        </p>
      )}
      {check.passes ? (
        <p className="rounded-md border border-success/30 bg-success-soft px-3 py-2 text-sm font-medium text-success">
          Every required element is present, and no placeholder is left to fill.
        </p>
      ) : (
        <>
          <p className="text-sm font-medium text-ink">{summary(check.findings)}</p>
          <ol aria-label="Findings" className="flex flex-col gap-1.5">
            {check.findings.map((finding, index) => (
              <li key={`${finding.code}-${finding.element ?? ''}-${finding.line ?? ''}-${index}`}>
                <FindingRow finding={finding} onJumpToLine={onJumpToLine} />
              </li>
            ))}
          </ol>
        </>
      )}
      {presences.length > 0 && (
        <details className="text-sm">
          <summary className="cursor-pointer text-ink-muted">What the check looks for</summary>
          <ul className="mt-2 grid gap-1 sm:grid-cols-2">
            {presences.map((presence) => (
              <li key={presence.id} className="flex items-start gap-1.5">
                <span aria-hidden="true" className={presence.present ? 'text-success' : 'text-danger'}>
                  {presence.present ? '✓' : '✗'}
                </span>
                <span>
                  {presence.name} <span className="text-xs text-ink-faint">{presence.citation}</span>
                  <span className="sr-only">{presence.present ? ': present' : ': missing'}</span>
                </span>
              </li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}

function FindingRow({
  finding,
  onJumpToLine,
}: {
  finding: ConsentFinding;
  onJumpToLine: ((line: number) => void) | undefined;
}) {
  const body = (
    <>
      <span className="flex flex-wrap items-center gap-1.5">
        {finding.citation ? <Badge tone="danger">{finding.citation}</Badge> : <Badge tone="caution">To fill</Badge>}
      </span>
      <span className="mt-0.5 block text-sm text-ink">{finding.message}</span>
    </>
  );
  const frame = 'block w-full rounded-md border border-line bg-surface px-3 py-2 text-left';
  const line = finding.line;
  if (line === null || !onJumpToLine) return <div className={frame}>{body}</div>;
  return (
    <button
      type="button"
      onClick={() => onJumpToLine(line)}
      className={cx(
        frame,
        'hover:border-spruce hover:bg-spruce-soft focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce',
      )}
    >
      {body}
      <span className="mt-1 block text-xs font-medium text-spruce-ink">Go to line {line} in the text</span>
    </button>
  );
}
