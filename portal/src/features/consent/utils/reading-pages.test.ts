import { describe, expect, it } from 'vitest';
import { clampedPosition, readingPages } from './reading-pages';

const keyInformationHtml = '<p>You will walk a short route and answer questions. It takes about 40 minutes.</p>';
const sections = [
  { id: 's1', heading: 'Key information', html: keyInformationHtml },
  { id: 's2', heading: 'Purpose of the study', html: '<p>We want to learn how people find their way.</p>' },
  { id: 's3', heading: 'Risks and discomforts', html: '<p>No more than everyday life.</p>' },
];

describe('reading pages of a consent form', () => {
  it('puts the key information first and does not repeat it when the first section is the same text', () => {
    const pages = readingPages({ keyInformationHtml, sections });
    expect(pages.map((page) => page.heading)).toEqual([
      'Key information',
      'Purpose of the study',
      'Risks and discomforts',
    ]);
    expect(pages.map((page) => page.isKeyInformation)).toEqual([true, false, false]);
  });

  it('keeps every section of the form when the key information is a separate summary', () => {
    const pages = readingPages({ keyInformationHtml: '<p>In short: a walk and some questions.</p>', sections });
    expect(pages.map((page) => page.id)).toEqual(['key-information', 's1', 's2', 's3']);
  });

  it('still has a key information page for a form without sections', () => {
    expect(readingPages({ keyInformationHtml, sections: [] })).toHaveLength(1);
  });
});

describe('remembered reading position', () => {
  it.each([
    [2, 4, 2],
    [9, 4, 3],
    [-1, 4, 0],
    [1.5, 4, 0],
    ['2', 4, 0],
    [null, 4, 0],
  ])('%s with %i screens resumes at %i', (stored, screens, expected) => {
    expect(clampedPosition(stored, screens)).toBe(expected);
  });
});
