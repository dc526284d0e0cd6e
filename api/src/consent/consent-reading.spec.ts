import { describe, expect, it } from 'vitest';
import { readingSections } from './consent-reading';

describe('readingSections', () => {
  it('makes one screen per second-level heading, in order, without staff comments', () => {
    const sections = readingSections(
      '<!-- staff only -->\n# Title\n\nIntro\n\n## Key information\n<!-- element: key-information -->\nShort **summary**.\n\n## Risks\nSmall.\n',
    );
    expect(sections.map((s) => s.heading)).toEqual(['Key information', 'Risks']);
    expect(sections[0].html).toBe('<p>Short <strong>summary</strong>.</p>\n');
    expect(sections.some((s) => s.html.includes('element:'))).toBe(false);
  });
});
