import { describe, expect, it } from 'vitest';
import { ConsentError } from './consent-error';
import { isFingerprint, renderedConsentText, renderedTextFingerprint } from './consent-text';

describe('rendered consent text', () => {
  it('drops staff comments and normalizes line endings, trailing spaces and blank lines', () => {
    const source =
      '<!--\nSTAFF NOTICE\n-->\r\n\r\n# Title  \r\n\r\n\r\n\r\n## Key information\r\n<!-- element: key-information -->\r\nText.\t\r\n';
    expect(renderedConsentText(source)).toBe('# Title\n\n## Key information\n\nText.\n');
  });

  it('writes accented letters in NFC, so a decomposed "é" and a precomposed one give the same text', () => {
    const decomposed = 'Caf\u0065\u0301 and na\u0069\u0308ve\n';
    expect(renderedConsentText(decomposed)).toBe('Caf\u00e9 and na\u00efve\n');
  });

  it('is unchanged when applied to its own output', () => {
    const once = renderedConsentText('# A\r\n\r\n<!-- x -->\r\n\r\n\r\nB  \r\n');
    expect(renderedConsentText(once)).toBe(once);
  });

  it('refuses a comment that is never closed, naming the field', () => {
    expect(() => renderedConsentText('Text <!-- open', 'body')).toThrow(
      /^body: has a comment opened with "<!--" that is never closed/,
    );
  });

  it('refuses a form that is empty once comments are removed', () => {
    expect(() => renderedConsentText('<!-- only a note -->\n')).toThrow(ConsentError);
  });
});

describe('renderedTextFingerprint', () => {
  it('is SHA-256 of the UTF-8 bytes of the text', () => {
    // Reference: GNU coreutils, `printf 'abc\n' | sha256sum`.
    expect(renderedTextFingerprint('abc\n')).toBe('edeaaff3f1774ad2888673770c6d64097e391bc362d7d6fb34982ddf0efd18cb');
    // Reference: `printf 'caf\xc3\xa9\n' | sha256sum` — "é" as the two UTF-8 bytes C3 A9.
    expect(renderedTextFingerprint('caf\u00e9\n')).toBe(
      '7b49b9e063bd91a4f9252b413261f5557b9c570aa61516989499f64a62dbcdd6',
    );
  });

  it('is the same for the same visible form written on Windows and on Linux', () => {
    const windows = renderedConsentText('# Form\r\n\r\nText\r\n');
    const linux = renderedConsentText('# Form\n\nText\n');
    expect(renderedTextFingerprint(windows)).toBe(renderedTextFingerprint(linux));
  });

  it('changes when one visible character changes', () => {
    expect(renderedTextFingerprint('You are paid $10.\n')).not.toBe(renderedTextFingerprint('You are paid $18.\n'));
  });

  it('refuses a draft that still has comments or CRLF, so nobody fingerprints the raw source', () => {
    expect(() => renderedTextFingerprint('# Form\r\n')).toThrow(/^text: is not in rendered form/);
    expect(() => renderedTextFingerprint('<!-- element: b1 -->\nText\n')).toThrow(/^text: is not in rendered form/);
  });

  it('gives 64 lowercase hex characters', () => {
    expect(isFingerprint(renderedTextFingerprint('x\n'))).toBe(true);
    expect(isFingerprint('ABC')).toBe(false);
  });
});
