import { describe, expect, it } from 'vitest';
import { consentTextBlocks, renderConsentHtml, renderConsentPlainText } from './consent-markdown';

describe('renderConsentHtml', () => {
  it('renders Markdown and leaves out staff comments', () => {
    expect(
      renderConsentHtml(
        '<!-- staff only -->\n# Form\n\n## Key information\n<!-- element: key-information -->\n**Pay:** $10\n',
      ),
    ).toBe('<h1>Form</h1>\n<h2>Key information</h2>\n<p><strong>Pay:</strong> $10</p>\n');
  });

  it('shows raw HTML as text and drops script links (sanitize-html allow-list)', () => {
    const html = renderConsentHtml(
      'Hi <script>alert(1)</script> <img src=x onerror=alert(1)>\n\n[bad](javascript:alert(1)) [good](https://lab.test/x) [mail](mailto:a@lab.test)\n',
    );
    expect(html).not.toMatch(/<script|<img|href="javascript:/i);
    // markdown-it refuses the javascript: link, so it stays visible as text.
    expect(html).toContain('[bad](javascript:alert(1))');
    expect(html).toContain('&lt;script&gt;');
    expect(html).toContain('<a href="https://lab.test/x" rel="noopener noreferrer">good</a>');
    expect(html).toContain('<a href="mailto:a@lab.test" rel="noopener noreferrer">mail</a>');
  });
});

describe('consentTextBlocks', () => {
  it('gives headings with their level, paragraphs with bold runs, and list markers', () => {
    const blocks = consentTextBlocks(
      '# Title\n\n## Pay\n\n- **Per step.** Each step pays.\n- Second\n\n3. Third\n4. Fourth\n\nSee [the page](https://lab.test/p).\n\n---\n',
    );
    expect(blocks).toEqual([
      { kind: 'heading', level: 1, runs: [{ text: 'Title', bold: false }] },
      { kind: 'heading', level: 2, runs: [{ text: 'Pay', bold: false }] },
      {
        kind: 'paragraph',
        depth: 1,
        marker: '•',
        runs: [
          { text: 'Per step.', bold: true },
          { text: ' Each step pays.', bold: false },
        ],
      },
      { kind: 'paragraph', depth: 1, marker: '•', runs: [{ text: 'Second', bold: false }] },
      { kind: 'paragraph', depth: 1, marker: '3.', runs: [{ text: 'Third', bold: false }] },
      { kind: 'paragraph', depth: 1, marker: '4.', runs: [{ text: 'Fourth', bold: false }] },
      {
        kind: 'paragraph',
        depth: 0,
        marker: null,
        runs: [{ text: 'See the page (https://lab.test/p).', bold: false }],
      },
      { kind: 'rule' },
    ]);
  });

  it('unescapes Markdown escapes, so the text is what the participant read', () => {
    expect(consentTextBlocks('Protocol \\#12 \\*A\\* \\&copy;\n')).toEqual([
      { kind: 'paragraph', depth: 0, marker: null, runs: [{ text: 'Protocol #12 *A* &copy;', bold: false }] },
    ]);
  });
});

describe('renderConsentPlainText', () => {
  it('separates blocks by blank lines and keeps list items together', () => {
    expect(renderConsentPlainText('# Title\n\nIntro.\n\n- one\n- two\n\nEnd.\n')).toBe(
      'Title\n\nIntro.\n\n• one\n• two\n\nEnd.\n',
    );
  });
});
