import { renderConsentHtml } from './consent-markdown';
import { renderedConsentText } from './consent-text';

export interface ReadingSection {
  id: string;
  heading: string;
  html: string;
}

/**
 * Splits a form into the screens a participant pages through: one per second-level heading, in order, so the key
 * information (which the required-elements check insists comes first) is the first screen.
 */
export function readingSections(markdownSource: string): ReadingSection[] {
  const lines = renderedConsentText(markdownSource).split('\n');
  const sections: Array<{ heading: string; lines: string[] }> = [];
  for (const line of lines) {
    const heading = /^##\s+(.+?)\s*#*\s*$/.exec(line);
    if (heading) sections.push({ heading: heading[1], lines: [] });
    else if (sections.length > 0) sections[sections.length - 1].lines.push(line);
  }
  return sections.map((section, index) => ({
    id: `section-${index + 1}`,
    heading: section.heading,
    html: renderConsentHtml(section.lines.join('\n').trim() === '' ? '&nbsp;' : section.lines.join('\n')),
  }));
}
