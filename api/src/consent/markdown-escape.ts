/**
 * How study fields are written into Markdown templates, so a value always shows as the literal text typed.
 *
 * Values are single-line: line breaks, tabs and other control characters become spaces, runs of spaces
 * collapse, and the value is trimmed. Then, by CommonMark's backslash escapes:
 * - always escaped: \ ` * _ { } [ ] < > | ~ &  (emphasis, code, links, raw HTML and autolinks, tables,
 *   strikethrough, entity references; braces so a filled form never looks like an unfilled placeholder);
 * - escaped only at the start of the value, where a placeholder may begin a line: # + - = and the . or ) after
 *   leading digits (headings, list items, setext underlines, ordered lists).
 * Checked against markdown-it in markdown-escape.spec.ts: every escaped value renders as its literal text.
 */
const ALWAYS_ESCAPED = /[\\`*_{}[\]<>|~&]/g;

export function singleLine(value: string): string {
  return value
    .replace(/[\u0000-\u001f\u007f\u2028\u2029]+/g, ' ')
    .replace(/ {2,}/g, ' ')
    .trim();
}

export function escapeMarkdownText(value: string): string {
  return singleLine(value)
    .replace(ALWAYS_ESCAPED, (c) => `\\${c}`)
    .replace(/^([#+\-=])/, '\\$1')
    .replace(/^(\d+)([.)])/, '$1\\$2');
}

/**
 * An absolute http(s) or mailto URL, safe as a Markdown link destination: parentheses, spaces and angle
 * brackets percent-encoded. Returns null when the value is not such a URL.
 */
export function markdownLinkDestination(value: string): string | null {
  let url: URL;
  try {
    url = new URL(value.trim());
  } catch {
    return null;
  }
  if (!['http:', 'https:', 'mailto:'].includes(url.protocol)) return null;
  return url.href.replace(/[()<> \\]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')}`);
}
