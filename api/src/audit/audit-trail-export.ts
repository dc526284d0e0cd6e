import { createHash } from 'node:crypto';
import { stringify } from 'csv-stringify/sync';
import { ACTION_FAMILIES, familyOf } from './audit-sentences';

/** What a CSV row needs of one event (a TrailEvent satisfies it). */
export interface ExportableEvent {
  id: string;
  chain: string;
  sequence: number;
  at: Date;
  family: string;
  name: string;
  sentence: string;
  actorPhrase: string;
  participantReference: string | null;
  studyTitle: string | null;
  amount: { minor: number; currency: string } | null;
  hash: string;
  keyId: string | null;
}

export const EXPORT_COLUMNS = [
  'when_utc',
  'study',
  'kind',
  'action',
  'what_happened',
  'by',
  'participant',
  'amount',
  'currency',
  'chain',
  'link',
  'hash',
  'key_id',
  'event_id',
] as const;

// Excel and LibreOffice read a CSV as UTF-8 only when it starts with the byte-order mark.
const BYTE_ORDER_MARK = '\uFEFF';

// OWASP "CSV injection": a cell a spreadsheet would read as a formula is prefixed with an apostrophe.
function spreadsheetSafe(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** Minor units to the currency's own units as plain digits ("36.00", "500" for yen), per ISO 4217's exponent. */
export function majorUnits(minor: number, currency: string): string {
  let digits = 2;
  try {
    digits =
      new Intl.NumberFormat('en-US', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    // an unknown code keeps two decimals
  }
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  if (digits === 0) return `${sign}${abs}`;
  const scale = 10 ** digits;
  return `${sign}${Math.floor(abs / scale)}.${String(abs % scale).padStart(digits, '0')}`;
}

const familyLabel = (key: string) => ACTION_FAMILIES.find((family) => family.key === key)?.label ?? key;

export function csvRows(events: ExportableEvent[]): string {
  return stringify(
    events.map((event) => [
      event.at.toISOString(),
      spreadsheetSafe(event.studyTitle ?? (event.chain === 'lab' ? 'Lab-wide' : event.chain)),
      familyLabel(event.family),
      spreadsheetSafe(event.name),
      spreadsheetSafe(event.sentence),
      spreadsheetSafe(event.actorPhrase),
      event.participantReference ?? '',
      event.amount ? majorUnits(event.amount.minor, event.amount.currency) : '',
      event.amount?.currency ?? '',
      event.chain,
      event.sequence,
      event.hash,
      event.keyId ?? '',
      event.id,
    ]),
  );
}

export function csvHeader(): string {
  return BYTE_ORDER_MARK + stringify([[...EXPORT_COLUMNS]]);
}

export interface ChainCheck {
  chain: string;
  label: string;
  eventsInChain: number;
  eventsListed: number;
  intact: boolean;
  /** Plain words for the first failing event, when the chain is broken. */
  firstFailure: string | null;
}

export interface SummaryInput {
  exportedAt: Date;
  exportedBy: string;
  fileName: string;
  fileSha256: string;
  selection: string[];
  listed: number;
  byAction: Map<string, number>;
  chains: ChainCheck[];
  receipt: {
    number: number | null;
    id: string | null;
    issuedAt: string | null;
    source: 'latest' | 'given';
    valid: boolean;
  } | null;
  receiptProblem: string | null;
}

/** The verification summary that goes with an export: what was selected, how many, and whether the chains hold. */
export function verificationSummary(input: SummaryInput): string {
  const byFamily = new Map<string, number>();
  for (const [action, count] of input.byAction)
    byFamily.set(familyOf(action), (byFamily.get(familyOf(action)) ?? 0) + count);
  const intact = input.chains.every((chain) => chain.intact) && !input.receiptProblem;
  const lines = [
    'Evenhand audit trail: verification summary',
    '',
    `Exported: ${input.exportedAt.toISOString()} by ${input.exportedBy}`,
    `File: ${input.fileName}`,
    `SHA-256 of the file: ${input.fileSha256}`,
    '',
    'Selection',
    ...input.selection.map((line) => `  ${line}`),
    '',
    `Events listed: ${input.listed}`,
    ...ACTION_FAMILIES.filter((family) => byFamily.has(family.key)).map(
      (family) => `  ${family.label}: ${byFamily.get(family.key)}`,
    ),
    '',
    'Verification',
    `  Verdict: ${intact ? 'intact. No event in these chains was changed, removed or slipped in after it was written.' : 'NOT intact. See the first failing event below.'}`,
    input.receipt
      ? `  Checked against audit receipt no. ${input.receipt.number ?? '?'} (${input.receipt.id ?? 'no id'}), issued ${input.receipt.issuedAt ?? 'at an unknown time'}${input.receipt.source === 'latest' ? ', the latest issued' : ''}${input.receipt.valid ? '' : ', which itself failed its check'}.`
      : '  No audit receipt has been issued yet: the links and keyed hashes were checked, but the deletion of the newest events cannot be ruled out.',
    ...(input.receiptProblem ? [`  Receipt: ${input.receiptProblem}`] : []),
    '  Chains in this selection:',
    ...input.chains.map(
      (chain) =>
        `    ${chain.label}: ${chain.eventsListed} of its ${chain.eventsInChain} events listed; ${chain.intact ? 'intact' : 'BROKEN'}` +
        (chain.firstFailure ? `\n      First failing event: ${chain.firstFailure}` : ''),
    ),
    '',
    'Check the file: its SHA-256 must equal the one above (for example `sha256sum` on Linux, `shasum -a 256` on macOS).',
    '',
  ];
  return lines.join('\n');
}

export function sha256Hex(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}
