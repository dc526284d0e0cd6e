/**
 * The sections of a consent form as the required-elements check and the reading screens see them: each heading
 * below the title, the element markers under it, and how many words it holds.
 */
import MarkdownIt from 'markdown-it';
import { ConsentErrorCode, consentFail } from './consent-error';
import { countWords } from './reading-time';

type Token = ReturnType<MarkdownIt['parse']>[number];

// HTML is parsed here (never rendered) so the comment markers arrive as their own tokens.
const parser = new MarkdownIt({ html: true });
const MARKER = /<!--\s*element:\s*([\w-]+(?:[\s,]+[\w-]+)*)\s*-->/g;

export interface ConsentSection {
  heading: string;
  level: number;
  /** 1-based line of the heading in the source. */
  line: number;
  /** Element ids from `<!-- element: … -->` markers in the section's own text (not its subsections). */
  markers: string[];
  /** Words in the section's own text (not its subsections). */
  ownWords: number;
  /** Words including the subsections below it. */
  words: number;
}

export interface ConsentOutline {
  /** The leading level-1 heading, if the form starts with one. */
  title: string | null;
  /** Words before the first section, title excluded. */
  preambleWords: number;
  sections: ConsentSection[];
}

function inlineText(token: Token | undefined): string {
  return (token?.children ?? [])
    .map((child) =>
      child.type === 'text' || child.type === 'code_inline' ? child.content : child.type === 'softbreak' ? ' ' : '',
    )
    .join('')
    .trim();
}

function markersIn(html: string): string[] {
  return [...html.matchAll(MARKER)].flatMap((match) => match[1].split(/[\s,]+/));
}

export function outlineConsent(markdownSource: string, field = 'body'): ConsentOutline {
  if (typeof markdownSource !== 'string') consentFail(ConsentErrorCode.InvalidText, field, 'must be a text');
  const tokens = parser.parse(markdownSource.replace(/\r\n?/g, '\n'), {});
  let title: string | null = null;
  let preambleWords = 0;
  const sections: ConsentSection[] = [];
  const current = () => sections[sections.length - 1];

  for (let i = 0; i < tokens.length; i += 1) {
    const token = tokens[i];
    if (token.type === 'heading_open') {
      const level = Number(token.tag.slice(1));
      const inline = tokens[i + 1];
      if (level === 1 && title === null && sections.length === 0 && preambleWords === 0) {
        title = inlineText(inline);
      } else {
        const markers = (inline.children ?? [])
          .filter((c) => c.type === 'html_inline')
          .flatMap((c) => markersIn(c.content));
        sections.push({
          heading: inlineText(inline),
          level,
          line: (token.map?.[0] ?? 0) + 1,
          markers,
          ownWords: 0,
          words: 0,
        });
      }
      i += 2;
    } else if (token.type === 'html_block') {
      current()?.markers.push(...markersIn(token.content));
    } else if (token.type === 'inline') {
      const words = countWords(inlineText(token));
      const markers = (token.children ?? [])
        .filter((c) => c.type === 'html_inline')
        .flatMap((c) => markersIn(c.content));
      const section = current();
      if (section) {
        section.ownWords += words;
        section.markers.push(...markers);
      } else {
        preambleWords += words;
      }
    } else if ((token.type === 'fence' || token.type === 'code_block') && token.content.trim()) {
      const section = current();
      if (section) section.ownWords += countWords(token.content);
      else preambleWords += countWords(token.content);
    }
  }

  sections.forEach((section, index) => {
    section.words = section.ownWords;
    for (let j = index + 1; j < sections.length && sections[j].level > section.level; j += 1)
      section.words += sections[j].ownWords;
  });
  return { title, preambleWords, sections };
}
