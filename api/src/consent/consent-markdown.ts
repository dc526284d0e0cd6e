/**
 * Markdown → what people see: sanitised HTML for screens and e-mail, and text blocks for the PDF and plain-text
 * e-mail. Both start from the rendered text (consent-text.ts), so staff comments never reach a participant.
 */
import MarkdownIt from 'markdown-it';
import sanitizeHtml from 'sanitize-html';
import { renderedConsentText } from './consent-text';

type Token = ReturnType<MarkdownIt['parse']>[number];

// Raw HTML is off: a form is Markdown only. Sanitising the output anyway keeps a later option change safe.
const markdown = new MarkdownIt({ html: false, linkify: false, typographer: false });

const SANITIZE_OPTIONS: sanitizeHtml.IOptions = {
  allowedTags: [
    'h1',
    'h2',
    'h3',
    'h4',
    'h5',
    'h6',
    'p',
    'br',
    'hr',
    'ul',
    'ol',
    'li',
    'strong',
    'em',
    's',
    'code',
    'pre',
    'blockquote',
    'a',
    'table',
    'thead',
    'tbody',
    'tr',
    'th',
    'td',
  ],
  allowedAttributes: { a: ['href', 'rel'], ol: ['start'], th: ['style'], td: ['style'] },
  allowedStyles: { '*': { 'text-align': [/^(left|right|center)$/] } },
  allowedSchemes: ['https', 'http', 'mailto'],
  allowProtocolRelative: false,
  transformTags: { a: sanitizeHtml.simpleTransform('a', { rel: 'noopener noreferrer' }) },
};

export function renderConsentHtml(markdownSource: string): string {
  return sanitizeHtml(markdown.render(renderedConsentText(markdownSource)), SANITIZE_OPTIONS);
}

/** A stretch of text in one weight. */
export interface TextRun {
  text: string;
  bold: boolean;
}

export type ConsentTextBlock =
  | { kind: 'heading'; level: number; runs: TextRun[] }
  /** `marker` is the list bullet or number of the item's first paragraph; `depth` counts list and quote nesting. */
  | { kind: 'paragraph'; runs: TextRun[]; depth: number; marker: string | null }
  | { kind: 'rule' };

function inlineRuns(token: Token): TextRun[] {
  const runs: TextRun[] = [];
  let bold = 0;
  const links: string[] = [];
  const push = (text: string) => {
    const last = runs[runs.length - 1];
    if (last && last.bold === bold > 0) last.text += text;
    else runs.push({ text, bold: bold > 0 });
  };
  for (const child of token.children ?? []) {
    switch (child.type) {
      case 'text':
      case 'code_inline':
        push(child.content);
        break;
      case 'softbreak':
        push(' ');
        break;
      case 'hardbreak':
        push('\n');
        break;
      case 'strong_open':
        bold += 1;
        break;
      case 'strong_close':
        bold -= 1;
        break;
      case 'link_open':
        links.push(child.attrGet('href') ?? '');
        break;
      case 'link_close': {
        // On paper a link has to show where it goes.
        const href = links.pop() ?? '';
        const shown = href.replace(/^mailto:/, '');
        const lastText = runs.map((r) => r.text).join('');
        if (shown && !lastText.endsWith(shown)) push(` (${shown})`);
        break;
      }
      case 'image':
        push(child.content);
        break;
      default:
        break;
    }
  }
  return runs.filter((run) => run.text.length > 0);
}

/** The form as blocks of text with headings, list markers and bold runs, in reading order. */
export function consentTextBlocks(markdownSource: string): ConsentTextBlock[] {
  const tokens = markdown.parse(renderedConsentText(markdownSource), {});
  const blocks: ConsentTextBlock[] = [];
  const lists: { ordered: boolean; next: number }[] = [];
  let depth = 0;
  let pendingMarker: string | null = null;
  let cells: string[] | null = null;

  for (let i = 0; i < tokens.length; i += 1) {
    const token = tokens[i];
    switch (token.type) {
      case 'heading_open':
        blocks.push({ kind: 'heading', level: Number(token.tag.slice(1)), runs: inlineRuns(tokens[i + 1]) });
        i += 2;
        break;
      case 'bullet_list_open':
      case 'ordered_list_open':
        lists.push({ ordered: token.type === 'ordered_list_open', next: Number(token.attrGet('start') ?? 1) });
        depth += 1;
        break;
      case 'bullet_list_close':
      case 'ordered_list_close':
        lists.pop();
        depth -= 1;
        break;
      case 'list_item_open': {
        const list = lists[lists.length - 1];
        pendingMarker = list.ordered ? `${list.next++}.` : '•';
        break;
      }
      case 'blockquote_open':
        depth += 1;
        break;
      case 'blockquote_close':
        depth -= 1;
        break;
      case 'inline':
        if (cells) {
          cells.push(
            inlineRuns(token)
              .map((r) => r.text)
              .join(''),
          );
        } else {
          blocks.push({ kind: 'paragraph', runs: inlineRuns(token), depth, marker: pendingMarker });
          pendingMarker = null;
        }
        break;
      case 'fence':
      case 'code_block':
        blocks.push({
          kind: 'paragraph',
          runs: [{ text: token.content.replace(/\n$/, ''), bold: false }],
          depth,
          marker: pendingMarker,
        });
        pendingMarker = null;
        break;
      case 'tr_open':
        cells = [];
        break;
      case 'tr_close':
        blocks.push({
          kind: 'paragraph',
          runs: [{ text: (cells ?? []).join(' | '), bold: false }],
          depth,
          marker: null,
        });
        cells = null;
        break;
      case 'hr':
        blocks.push({ kind: 'rule' });
        break;
      default:
        break;
    }
  }
  return blocks.filter((block) => block.kind === 'rule' || block.runs.length > 0);
}

/** Plain text, for the text part of an e-mail: blocks separated by blank lines, list items by line breaks. */
export function renderConsentPlainText(markdownSource: string): string {
  let text = '';
  let previousWasListItem = false;
  for (const block of consentTextBlocks(markdownSource)) {
    const isListItem = block.kind === 'paragraph' && block.marker !== null;
    if (text) text += previousWasListItem && isListItem ? '\n' : '\n\n';
    if (block.kind === 'rule') {
      text += '----';
    } else {
      const content = block.runs.map((run) => run.text).join('');
      const indent = block.kind === 'paragraph' ? '  '.repeat(Math.max(0, block.depth - 1)) : '';
      text +=
        block.kind === 'paragraph' && block.marker ? `${indent}${block.marker} ${content}` : `${indent}${content}`;
    }
    previousWasListItem = isListItem;
  }
  return `${text}\n`;
}
