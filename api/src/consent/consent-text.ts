/**
 * The rendered consent text: the one string that is shown, signed, printed in the PDF and fingerprinted.
 *
 * It is the Markdown source after placeholders were filled, normalized so the same visible form always
 * has the same bytes, whatever browser or operating system the editor used:
 *
 *   1. line endings CRLF and CR become LF (browsers submit textareas with CRLF);
 *   2. HTML comments `<!-- … -->` are removed — they hold the staff notice and the element markers,
 *      which participants never see;
 *   3. Unicode NFC (so "é" typed as e + combining accent and as one character hash alike);
 *   4. spaces and tabs at the end of each line are removed (write a hard line break as a trailing `\`);
 *   5. runs of blank lines become one blank line; leading blank lines are dropped;
 *   6. the text ends with exactly one LF.
 *
 * The fingerprint is SHA-256 over the UTF-8 bytes of that string, as 64 lowercase hex characters. An auditor can
 * recompute it from the stored text: `printf '%s' "$TEXT" | sha256sum` (with the final LF included in $TEXT).
 */
import { createHash } from 'node:crypto';
import { ConsentErrorCode, consentFail } from './consent-error';

const HTML_COMMENT = /<!--[\s\S]*?-->/g;

export function renderedConsentText(markdownSource: string, field = 'body'): string {
  if (typeof markdownSource !== 'string') consentFail(ConsentErrorCode.InvalidText, field, 'must be a text');
  const withoutComments = markdownSource.replace(/\r\n?/g, '\n').replace(HTML_COMMENT, '');
  if (withoutComments.includes('<!--')) {
    consentFail(
      ConsentErrorCode.InvalidText,
      field,
      'has a comment opened with "<!--" that is never closed with "-->"',
    );
  }
  const text = withoutComments
    .normalize('NFC')
    .split('\n')
    .map((line) => line.replace(/[ \t]+$/, ''))
    .join('\n')
    .replace(/\n{3,}/g, '\n\n')
    .replace(/^\n+/, '')
    .replace(/\n*$/, '\n');
  if (text.trim() === '') consentFail(ConsentErrorCode.InvalidText, field, 'is empty once staff comments are removed');
  return text;
}

/** SHA-256 hex of the rendered text; refuses text that is not in rendered form, so nobody hashes the raw draft. */
export function renderedTextFingerprint(text: string): string {
  if (typeof text !== 'string' || renderedConsentText(text, 'text') !== text) {
    consentFail(
      ConsentErrorCode.InvalidText,
      'text',
      'is not in rendered form (normalized line endings, no comments, NFC, one final line break): pass it through renderedConsentText first',
    );
  }
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

export function isFingerprint(value: unknown): value is string {
  return typeof value === 'string' && /^[0-9a-f]{64}$/.test(value);
}
