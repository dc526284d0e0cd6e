import fc from 'fast-check';
import MarkdownIt from 'markdown-it';
import { describe, expect, it } from 'vitest';
import { escapeMarkdownText, markdownLinkDestination, singleLine } from './markdown-escape';

// Reference renderer: markdown-it with its default CommonMark-plus-tables rules, as a participant's screen renders it.
const reference = new MarkdownIt({ html: true, linkify: false, typographer: false });
const asLiteralParagraph = (value: string) => `<p>${reference.utils.escapeHtml(value)}</p>\n`;

const MARKDOWN_PUNCTUATION = [...'\\`*_{}[]()<>#+-=.!|~&:;/"\' 019aZé'];

describe('escapeMarkdownText', () => {
  it('renders any value as its literal text, whatever Markdown punctuation it holds (checked against markdown-it)', () => {
    fc.assert(
      fc.property(
        fc.string({ unit: fc.constantFrom(...MARKDOWN_PUNCTUATION, '\n', '\t'), minLength: 1, maxLength: 24 }),
        (value) => {
          const literal = singleLine(value);
          fc.pre(literal !== '');
          expect(reference.render(escapeMarkdownText(value))).toBe(asLiteralParagraph(literal));
        },
      ),
      { numRuns: 3000 },
    );
  });

  it('also renders literally after template text on the same line and as a list item', () => {
    fc.assert(
      fc.property(
        fc.string({ unit: fc.constantFrom(...MARKDOWN_PUNCTUATION), minLength: 1, maxLength: 16 }),
        (value) => {
          const literal = singleLine(value);
          fc.pre(literal !== '');
          expect(reference.render(`Protocol ${escapeMarkdownText(value)}`)).toBe(
            asLiteralParagraph(`Protocol ${literal}`),
          );
          expect(reference.render(`- ${escapeMarkdownText(value)}`)).toBe(
            `<ul>\n<li>${reference.utils.escapeHtml(literal)}</li>\n</ul>\n`,
          );
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('neutralises the usual ways a field could inject markup', () => {
    for (const value of [
      '<script>alert(1)</script>',
      '[click](javascript:alert(1))',
      '**bold**',
      '# Heading',
      '1. first',
      '&copy; 2025',
      '| a | b |',
      '```code```',
      '{{studyTitle}}',
    ]) {
      expect(reference.render(escapeMarkdownText(value))).toBe(asLiteralParagraph(value));
    }
  });

  it('keeps a value on one line: line breaks and tabs become single spaces', () => {
    expect(escapeMarkdownText('Line one\r\n\r\n## Line two\tend')).toBe('Line one ## Line two end');
    expect(escapeMarkdownText('## Heading')).toBe('\\## Heading');
    expect(singleLine('  a \n\n b\t c  ')).toBe('a b c');
  });
});

describe('markdownLinkDestination', () => {
  it('accepts absolute http(s) and mailto addresses and percent-encodes what would end a Markdown link', () => {
    expect(markdownLinkDestination('https://portal.test/studies/wayfinding-cues?from=mail')).toBe(
      'https://portal.test/studies/wayfinding-cues?from=mail',
    );
    const destination = markdownLinkDestination('https://portal.test/a (b)/<c>');
    expect(destination).toBe('https://portal.test/a%20%28b%29/%3Cc%3E');
    // markdown-it keeps the whole address inside the link.
    expect(reference.render(`[x](${destination})`)).toBe(
      '<p><a href="https://portal.test/a%20%28b%29/%3Cc%3E">x</a></p>\n',
    );
  });

  it('refuses relative and script addresses', () => {
    expect(markdownLinkDestination('/studies/x')).toBeNull();
    expect(markdownLinkDestination('javascript:alert(1)')).toBeNull();
    expect(markdownLinkDestination('data:text/html,hi')).toBeNull();
  });
});
