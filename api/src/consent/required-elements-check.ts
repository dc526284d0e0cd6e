/**
 * Which required elements of informed consent a draft is missing (45 CFR 46.116(a)(5)(i) and (b)(1)–(9)).
 *
 * How an element is recognised (see required-elements.ts): a section whose marker names it, or — for a section
 * without any marker — whose heading matches the element's usual wording. It counts as present once a section
 * for it has at least MIN_SECTION_WORDS words of text (its subsections included). The key information must be
 * the first section, with no more than PREAMBLE_WORD_LIMIT words between the title and it (room for the study
 * title, institution and protocol number). Findings come in the order key information, (b)(1)…(b)(9), then
 * placeholders still to fill; a form passes when there are none.
 */
import { ConsentSection, outlineConsent } from './consent-outline';
import {
  ConsentElement,
  ConsentElementId,
  OPTIONAL_ELEMENT_IDS,
  REQUIRED_ELEMENT_IDS,
  RequiredElementId,
  consentElement,
} from './required-elements';
import { TO_FILL_PATTERN } from './template-rendering';

export const MIN_SECTION_WORDS = 5;
export const PREAMBLE_WORD_LIMIT = 60;

export type ConsentFindingCode =
  'missing-element' | 'empty-element' | 'key-information-not-first' | 'unfilled-placeholder';

export interface ConsentFinding {
  code: ConsentFindingCode;
  /** The element concerned; null for a placeholder still to fill. */
  element: RequiredElementId | null;
  citation: string | null;
  /** 1-based source line the finding points at, when there is one. */
  line: number | null;
  message: string;
}

export interface ElementPresence {
  id: ConsentElementId;
  citation: string;
  name: string;
  present: boolean;
  /** The section that covers it, when one does. */
  heading: string | null;
  line: number | null;
  recognisedBy: 'marker' | 'heading' | null;
}

export interface RequiredElementsReport {
  passes: boolean;
  findings: ConsentFinding[];
  required: ElementPresence[];
  optional: ElementPresence[];
}

function normalizedHeading(heading: string): string {
  return heading.toLowerCase().replace(/[’‘]/g, "'").replace(/\s+/g, ' ').trim();
}

type Candidate = { section: ConsentSection; by: 'marker' | 'heading' };

function sectionsFor(element: ConsentElement, sections: ConsentSection[]): Candidate[] {
  return sections.flatMap((section): Candidate[] => {
    if (section.markers.length > 0)
      return section.markers.includes(element.id) ? [{ section, by: 'marker' as const }] : [];
    const heading = normalizedHeading(section.heading);
    return element.headingPatterns.some((pattern) => pattern.test(heading))
      ? [{ section, by: 'heading' as const }]
      : [];
  });
}

interface ElementSearch {
  presence: ElementPresence;
  /** The section that covers the element, when one has enough text. */
  section: ConsentSection | null;
  /** A section meant for the element that has (almost) no text. */
  emptySection: ConsentSection | null;
}

function searchElement(element: ConsentElement, sections: ConsentSection[]): ElementSearch {
  const candidates = sectionsFor(element, sections);
  const filled = candidates.find((c) => c.section.words >= MIN_SECTION_WORDS);
  const chosen = filled ?? candidates[0] ?? null;
  return {
    presence: {
      id: element.id,
      citation: element.citation,
      name: element.name,
      present: filled !== undefined,
      heading: chosen?.section.heading ?? null,
      line: chosen?.section.line ?? null,
      recognisedBy: chosen?.by ?? null,
    },
    section: filled?.section ?? null,
    emptySection: filled ? null : (chosen?.section ?? null),
  };
}

function elementFinding(element: ConsentElement, emptySection: ConsentSection | null): ConsentFinding {
  const id = element.id as RequiredElementId;
  if (emptySection) {
    return {
      code: 'empty-element',
      element: id,
      citation: element.citation,
      line: emptySection.line,
      message: `${element.name} (${element.citation}): the section "${emptySection.heading}" on line ${emptySection.line} has almost no text. Write a section that ${element.requirement}.`,
    };
  }
  return {
    code: 'missing-element',
    element: id,
    citation: element.citation,
    line: null,
    message: `${element.name} (${element.citation}) is missing. Add a section, for example headed "${element.suggestedHeading}", that ${element.requirement}.`,
  };
}

export function checkRequiredElements(markdownSource: string): RequiredElementsReport {
  const outline = outlineConsent(markdownSource);
  const findings: ConsentFinding[] = [];
  const required = REQUIRED_ELEMENT_IDS.map((id) => {
    const element = consentElement(id);
    const { presence, section, emptySection } = searchElement(element, outline.sections);
    if (!presence.present) findings.push(elementFinding(element, emptySection));

    if (id === 'key-information' && section) {
      const first = outline.sections[0];
      if (first !== section || outline.preambleWords > PREAMBLE_WORD_LIMIT) {
        const before =
          first !== section
            ? `the section "${first.heading}" comes before it`
            : `${outline.preambleWords} words of text come before it`;
        findings.push({
          code: 'key-information-not-first',
          element: id,
          citation: element.citation,
          line: section.line,
          message: `Key information (${element.citation}) must begin the form, but ${before}. Move "${section.heading}" (line ${section.line}) so it is the first section after the title.`,
        });
      }
    }
    return presence;
  });

  const optional = OPTIONAL_ELEMENT_IDS.map((id) => searchElement(consentElement(id), outline.sections).presence);

  const lines = markdownSource.replace(/\r\n?/g, '\n').split('\n');
  lines.forEach((text, index) => {
    for (const match of text.matchAll(TO_FILL_PATTERN)) {
      findings.push({
        code: 'unfilled-placeholder',
        element: null,
        citation: null,
        line: index + 1,
        message: `Line ${index + 1} still says "[to fill: ${match[1].replace(/\\(.)/g, '$1')}]": replace it with the study's details.`,
      });
    }
    for (const match of text.matchAll(/\{\{\s*([^}]*?)\s*\}\}/g)) {
      findings.push({
        code: 'unfilled-placeholder',
        element: null,
        citation: null,
        line: index + 1,
        message: `Line ${index + 1} still has the template placeholder "{{${match[1]}}}": replace it with the study's details.`,
      });
    }
  });

  return { passes: findings.length === 0, findings, required, optional };
}
