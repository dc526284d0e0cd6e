/**
 * What changed between the consent version a person signed and the one they are asked to sign now, in short plain
 * sentences for the re-consent e-mail and the participant's form: the values staff gave the template, the steps and
 * their pay as the form lists them, and the sections that appeared, went or were reworded.
 *
 * A section counts as reworded only when its text still differs after each change already listed is applied to
 * the old text, so a pay change is not reported a second time as "reworded: Payment".
 */

export interface ComparedConsentVersion {
  /** The values staff gave the template (not the study's own facts, which the body shows). */
  templateValues: Record<string, unknown>;
  /** The form as Markdown, placeholders filled. */
  body: string;
}

interface Replacement {
  from: string;
  to: string;
}

interface Change {
  sentence: string;
  /** Old → new text, to tell a change already listed from a reworded section. */
  replacements: Replacement[];
  /** Text a listed change moves elsewhere too (a step's pay moves the total), blanked out before comparing. */
  alsoMoves?: RegExp;
}

// An amount with its currency sign on either side, e.g. $1,250.00 or 12,50 €.
const MONEY = /\p{Sc}\s?\d[\d.,\u00a0]*|\d[\d.,\u00a0]*\s?\p{Sc}/gu;
// A time such as "about 50 minutes" or "about 1 hour and 20 minutes".
const DURATION = /about [^.;]*?(?:minutes?|hours?)/g;

type ValueDescriber = (before: unknown, after: unknown) => string | null;

const text = (value: unknown): string | null =>
  typeof value === 'string' && value.trim() !== '' ? value.trim() : typeof value === 'number' ? String(value) : null;

const quantity = (value: unknown, one: string, many: string): string | null =>
  typeof value === 'number' ? `${value} ${value === 1 ? one : many}` : null;

function changedTo(subject: string, before: string | null, after: string | null): string | null {
  if (before === after) return null;
  if (before === null) return `${subject}: now ${after}.`;
  if (after === null) return `${subject}: no longer given (it was ${before}).`;
  return `${subject} changed from ${before} to ${after}.`;
}

/** Plain wording for each value staff can give the template; values missing here are reported by section. */
const describers: Record<string, ValueDescriber> = {
  studyTitle: (a, b) => changedTo('The study’s title', quote(text(a)), quote(text(b))),
  institutionName: (a, b) => changedTo('The institution', text(a), text(b)),
  labName: (a, b) => changedTo('The lab', text(a), text(b)),
  investigatorName: (a, b) => changedTo('The investigator in charge', text(a), text(b)),
  contactEmail: (a, b) => changedTo('The contact e-mail', text(a), text(b)),
  contactPhone: (a, b) => changedTo('The contact phone number', text(a), text(b)),
  ethicsBoardName: (a, b) => changedTo('The ethics board', text(a), text(b)),
  ethicsBoardContact: (a, b) => changedTo('The ethics board’s contact', text(a), text(b)),
  studyPurpose: (a, b) => (text(a) === text(b) ? null : 'The description of why we are doing the study was reworded.'),
  estimatedMinutes: (a, b) => changedTo('The total time', aboutMinutes(a), aboutMinutes(b)),
  targetSize: (a, b) => changedTo('The number of people taking part', text(a), text(b)),
  paymentMethod: (a, b) => changedTo('How you are paid', text(a), text(b)),
  paymentDays: (a, b) =>
    typeof a === 'number' && typeof b === 'number'
      ? a === b
        ? null
        : `Payment is now sent within ${quantity(b, 'day', 'days')} of a confirmed step (it was ${quantity(a, 'day', 'days')}).`
      : changedTo('The time within which payment is sent', quantity(a, 'day', 'days'), quantity(b, 'day', 'days')),
  dataRetentionYears: (a, b) =>
    typeof a === 'number' && typeof b === 'number'
      ? a === b
        ? null
        : `Your records are now kept for ${quantity(b, 'year', 'years')} after the study ends (it was ${quantity(a, 'year', 'years')}).`
      : changedTo('How long your records are kept', quantity(a, 'year', 'years'), quantity(b, 'year', 'years')),
  futureUseDeidentified: (a, b) =>
    a === b || typeof b !== 'boolean'
      ? null
      : b
        ? 'Your information, with your name and contact details removed, may now be used in future research.'
        : 'Your information will no longer be used in future research.',
};

function quote(value: string | null): string | null {
  return value === null ? null : `“${value}”`;
}

function aboutMinutes(value: unknown): string | null {
  return typeof value === 'number' ? `about ${quantity(value, 'minute', 'minutes')}` : null;
}

function valueChanges(before: Record<string, unknown>, after: Record<string, unknown>): Change[] {
  const changes: Change[] = [];
  for (const [field, describe] of Object.entries(describers)) {
    const sentence = describe(before[field], after[field]);
    if (!sentence) continue;
    const from = text(before[field]);
    const to = text(after[field]);
    changes.push({
      sentence,
      replacements: from !== null && to !== null ? [{ from, to }] : [],
      ...(field === 'estimatedMinutes' && { alsoMoves: DURATION }),
    });
  }
  return changes;
}

interface ListedStep {
  title: string;
  pay: string;
  minutes: string | null;
}

const MARKDOWN_ESCAPE = /\\([\\`*_{}[\]()#+\-.!|<>~:&])/g;
const plain = (markdown: string) => markdown.replace(MARKDOWN_ESCAPE, '$1');
// The steps list of the templates: `1. **Title** — $10.00, about 20 minutes. Description`.
const STEP_LINE = /^\d+\.\s+\*\*(.+?)\*\*\s+—\s+(.+?)(?:, about (\d+) minutes)?\.(?:\s|$)/;

function listedSteps(body: string): ListedStep[] {
  return withoutComments(body)
    .split('\n')
    .map((line) => STEP_LINE.exec(line.trim()))
    .filter((match): match is RegExpExecArray => match !== null)
    .map((match) => ({ title: plain(match[1]), pay: plain(match[2]), minutes: match[3] ?? null }));
}

function stepChanges(before: ListedStep[], after: ListedStep[]): Change[] {
  const changes: Change[] = [];
  const remaining = [...before];
  const kept: Array<[ListedStep, ListedStep]> = [];
  const added: ListedStep[] = [];
  for (const step of after) {
    const index = remaining.findIndex((old) => old.title === step.title);
    if (index >= 0) kept.push([remaining.splice(index, 1)[0], step]);
    else added.push(step);
  }
  // A step whose title alone changed (same place, same pay) is renamed rather than removed and added.
  if (added.length === remaining.length) {
    for (let i = added.length - 1; i >= 0; i -= 1) {
      const [renamedFrom, renamedTo] = [remaining[i], added[i]];
      if (renamedFrom.pay !== renamedTo.pay) continue;
      changes.push({
        sentence: `The step “${renamedFrom.title}” is now called “${renamedTo.title}”.`,
        replacements: [{ from: renamedFrom.title, to: renamedTo.title }],
      });
      kept.push([renamedFrom, renamedTo]);
      remaining.splice(i, 1);
      added.splice(i, 1);
    }
  }
  for (const [old, step] of kept) {
    if (old.pay !== step.pay) {
      changes.push({
        sentence: `Pay for “${step.title}” changed from ${old.pay} to ${step.pay}.`,
        replacements: [{ from: old.pay, to: step.pay }],
        alsoMoves: MONEY,
      });
    }
    if (old.minutes !== step.minutes && old.minutes !== null && step.minutes !== null) {
      changes.push({
        sentence: `“${step.title}” now takes about ${step.minutes} minutes (it was about ${old.minutes}).`,
        replacements: [{ from: `about ${old.minutes} minutes`, to: `about ${step.minutes} minutes` }],
        alsoMoves: DURATION,
      });
    }
  }
  for (const step of added)
    changes.push({ sentence: `New step: “${step.title}”, paying ${step.pay}.`, replacements: [] });
  for (const step of remaining) changes.push({ sentence: `Step removed: “${step.title}”.`, replacements: [] });
  return changes;
}

interface Section {
  heading: string;
  text: string;
}

function withoutComments(body: string): string {
  return body.replace(/<!--[\s\S]*?-->/g, '').replace(/\r\n?/g, '\n');
}

/** The form's sections below its title: each `##`-or-deeper heading with the text up to the next heading. */
function sectionsOf(body: string): Section[] {
  const sections: Section[] = [];
  for (const line of withoutComments(body).split('\n')) {
    const heading = /^#{2,6}\s+(.+?)\s*#*\s*$/.exec(line);
    if (heading) sections.push({ heading: plain(heading[1]), text: '' });
    else if (sections.length > 0) sections[sections.length - 1].text += `${line}\n`;
  }
  return sections.map((section) => ({ heading: section.heading, text: normalized(section.text) }));
}

// A bare number is replaced only where it stands alone, so 5 → 10 years leaves $15.00 alone.
function replaced(sectionText: string, { from, to }: Replacement): string {
  if (!/^\d+$/.test(from)) return sectionText.split(from).join(to);
  return sectionText.replace(new RegExp(`(?<![\\d.,])${from}(?![\\d]|[.,]\\d)`, 'g'), to);
}

const normalized = (markdown: string) => markdown.replace(/\s+/g, ' ').trim();

function sectionChanges(before: string, after: string, explained: Replacement[], moved: RegExp[]): Change[] {
  const blanked = (sectionText: string) =>
    moved.reduce((textSoFar, pattern) => textSoFar.replace(pattern, '…'), sectionText);
  const old = new Map(sectionsOf(before).map((section) => [section.heading, section.text]));
  const changes: Change[] = [];
  const seen = new Set<string>();
  for (const section of sectionsOf(after)) {
    seen.add(section.heading);
    const previous = old.get(section.heading);
    if (previous === undefined) {
      changes.push({ sentence: `New section: “${section.heading}”.`, replacements: [] });
      continue;
    }
    const withListedChanges = explained.reduce((textSoFar, change) => replaced(textSoFar, change), plain(previous));
    if (blanked(withListedChanges) !== blanked(plain(section.text)))
      changes.push({ sentence: `Reworded: “${section.heading}”.`, replacements: [] });
  }
  for (const heading of old.keys())
    if (!seen.has(heading)) changes.push({ sentence: `Section removed: “${heading}”.`, replacements: [] });
  return changes;
}

/** Short plain sentences, most specific first; empty when the two versions say the same. */
export function summarizeConsentChanges(signed: ComparedConsentVersion, current: ComparedConsentVersion): string[] {
  const listed = [
    ...valueChanges(signed.templateValues ?? {}, current.templateValues ?? {}),
    ...stepChanges(listedSteps(signed.body), listedSteps(current.body)),
  ];
  const replacements = listed.flatMap((change) => change.replacements);
  const moved = [...new Set(listed.flatMap((change) => (change.alsoMoves ? [change.alsoMoves] : [])))];
  const sections = sectionChanges(signed.body, current.body, replacements, moved);
  return [...listed, ...sections].map((change) => change.sentence);
}

/** The summary as one paragraph for an e-mail; a general sentence when nothing specific can be named. */
export function consentChangeParagraph(changes: readonly string[]): string {
  return changes.length > 0 ? changes.join(' ') : 'The research team has updated the wording of the consent form.';
}
