/**
 * Fills a template's placeholders with Handlebars (strict mode: a placeholder the view lacks is an error,
 * never an empty gap) after escaping every value for where it lands — see markdown-escape.ts.
 *
 * Views are plain data: strings, numbers, booleans, null, arrays and objects. Strings are escaped as Markdown
 * text; a key ending in `Url` must hold an absolute http(s) or mailto URL; a `MarkdownFragment` is inserted as
 * it is (for Markdown the caller built from escaped parts, such as a "to fill" marker).
 */
import Handlebars from 'handlebars';
import { ConsentError, ConsentErrorCode, FieldError } from './consent-error';
import { escapeMarkdownText, markdownLinkDestination, singleLine } from './markdown-escape';

export class MarkdownFragment {
  constructor(readonly markdown: string) {}
}

export type TemplateValue =
  string | number | boolean | null | MarkdownFragment | TemplateValue[] | { [key: string]: TemplateValue };
export type TemplateView = { [key: string]: TemplateValue };

/** Visible in the filled form and reported by the required-elements check until someone replaces it. */
export function toFill(label: string): MarkdownFragment {
  return new MarkdownFragment(`\\[to fill: ${escapeMarkdownText(label)}\\]`);
}
export const TO_FILL_PATTERN = /\\?\[to fill: ((?:[^\]\\]|\\.)+?)\\?\]/g;

// An isolated environment: no helpers or partials registered by anything else in the process.
const handlebars = Handlebars.create();
const COMPILE_OPTIONS: CompileOptions = { strict: true, noEscape: true, knownHelpersOnly: true };

type Escaping = 'markdown' | 'plain';

function escapeView(value: TemplateValue, path: string, escaping: Escaping, errors: FieldError[]): unknown {
  if (value === null || typeof value === 'boolean') return value;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) errors.push({ field: path, message: 'must be a finite number' });
    return String(value);
  }
  if (value instanceof MarkdownFragment) {
    return escaping === 'markdown' ? value.markdown : singleLine(value.markdown.replace(/\\(.)/g, '$1'));
  }
  if (typeof value === 'string') {
    if (/Url$/.test(path.split('.').pop() ?? '')) {
      const destination = markdownLinkDestination(value);
      if (destination === null) errors.push({ field: path, message: 'must be an absolute http(s) or mailto address' });
      return destination;
    }
    return escaping === 'markdown' ? escapeMarkdownText(value) : singleLine(value);
  }
  if (Array.isArray(value)) return value.map((item, i) => escapeView(item, `${path}[${i}]`, escaping, errors));
  if (typeof value === 'object') {
    const escaped: Record<string, unknown> = {};
    for (const [key, member] of Object.entries(value))
      escaped[key] = escapeView(member, path ? `${path}.${key}` : key, escaping, errors);
    return escaped;
  }
  errors.push({ field: path, message: `has an unsupported type (${typeof value})` });
  return null;
}

export function renderTemplate(
  source: string,
  view: TemplateView,
  escaping: Escaping = 'markdown',
  field = 'template',
): string {
  if (typeof source !== 'string')
    throw new ConsentError(ConsentErrorCode.InvalidTemplate, [{ field, message: 'must be a text' }]);
  const errors: FieldError[] = [];
  const escapedView = escapeView(view, '', escaping, errors);
  if (errors.length > 0) throw new ConsentError(ConsentErrorCode.InvalidFields, errors);
  try {
    return handlebars.compile(source, COMPILE_OPTIONS)(escapedView);
  } catch (error: unknown) {
    const message = error instanceof Error ? error.message : String(error);
    const missing = /"([^"]+)" not defined in .*? - (\d+):\d+/.exec(message);
    const problem = missing
      ? `uses {{${missing[1]}}} on line ${missing[2]}, which the study's fields do not provide`
      : `is not a valid template: ${message.split('\n')[0]}`;
    throw new ConsentError(ConsentErrorCode.InvalidTemplate, [{ field, message: problem }]);
  }
}
