import { describe, expect, it } from 'vitest';
import { wayfindingConsentFields } from './consent-fields.fixture';
import { fillConsentTemplate } from './consent-template';
import { REQUIRED_ELEMENT_IDS } from './required-elements';
import { checkRequiredElements } from './required-elements-check';

// The list checked is 45 CFR 46.116 (revised Common Rule): (a)(5)(i) key information first, (b)(1)–(9) basic elements.
const REGULATION: Record<(typeof REQUIRED_ELEMENT_IDS)[number], string> = {
  'key-information': '45 CFR 46.116(a)(5)(i)',
  b1: '45 CFR 46.116(b)(1)',
  b2: '45 CFR 46.116(b)(2)',
  b3: '45 CFR 46.116(b)(3)',
  b4: '45 CFR 46.116(b)(4)',
  b5: '45 CFR 46.116(b)(5)',
  b6: '45 CFR 46.116(b)(6)',
  b7: '45 CFR 46.116(b)(7)',
  b8: '45 CFR 46.116(b)(8)',
  b9: '45 CFR 46.116(b)(9)',
};

const fullForm = fillConsentTemplate(wayfindingConsentFields);

/** The form cut into its title block and its "## " sections, by plain line splitting (independent of the outline code). */
function sectionsOf(markdown: string): { head: string; sections: string[] } {
  const [head, ...rest] = markdown.split(/\n(?=## )/);
  return { head, sections: rest };
}
const join = (head: string, sections: string[]) => [head, ...sections].join('\n');
const withoutSection = (markdown: string, id: string) => {
  const { head, sections } = sectionsOf(markdown);
  const kept = sections.filter((s) => !s.includes(`<!-- element: ${id} -->`));
  expect(kept.length).toBe(sections.length - 1);
  return join(head, kept);
};
const withoutMarkers = (markdown: string) => markdown.replace(/<!-- element: [\w-]+ -->\n/g, '');

describe('required elements of informed consent (45 CFR 46.116(a)(5)(i) and (b)(1)–(9))', () => {
  it('passes the full template filled for a study, with every element found by its marker', () => {
    const report = checkRequiredElements(fullForm);
    expect(report.findings).toEqual([]);
    expect(report.passes).toBe(true);
    expect(report.required.map((e) => [e.id, e.citation, e.present, e.recognisedBy])).toEqual(
      REQUIRED_ELEMENT_IDS.map((id) => [id, REGULATION[id], true, 'marker']),
    );
    // The optional 46.116(c) elements the template carries: (c)(2), (c)(4), (c)(6).
    expect(report.optional.map((e) => [e.citation, e.present])).toEqual([
      ['45 CFR 46.116(c)(2)', true],
      ['45 CFR 46.116(c)(4)', true],
      ['45 CFR 46.116(c)(6)', true],
    ]);
  });

  for (const id of REQUIRED_ELEMENT_IDS) {
    it(`reports exactly ${REGULATION[id]} when its section is removed`, () => {
      const report = checkRequiredElements(withoutSection(fullForm, id));
      expect(report.passes).toBe(false);
      expect(report.findings).toHaveLength(1);
      expect(report.findings[0]).toMatchObject({ code: 'missing-element', element: id, citation: REGULATION[id] });
      expect(report.findings[0].message).toContain(REGULATION[id]);
      expect(report.findings[0].message).toMatch(/is missing\. Add a section, for example headed ".+", that /);
    });

    it(`reports exactly ${REGULATION[id]} when its section is removed from a form whose markers were lost (heading wording)`, () => {
      const unmarked = withoutMarkers(fullForm);
      expect(checkRequiredElements(unmarked).findings).toEqual([]);
      const report = checkRequiredElements(withoutSection(fullForm, id).replace(/<!-- element: [\w-]+ -->\n/g, ''));
      expect(report.findings.map((f) => [f.code, f.element])).toEqual([['missing-element', id]]);
    });
  }

  it('reports key information that is not at the beginning of the form (45 CFR 46.116(a)(5)(i)), and nothing else', () => {
    const { head, sections } = sectionsOf(fullForm);
    const [keyInformation, purpose, ...rest] = sections;
    const report = checkRequiredElements(join(head, [purpose, keyInformation, ...rest]));
    expect(report.findings).toHaveLength(1);
    expect(report.findings[0]).toMatchObject({
      code: 'key-information-not-first',
      element: 'key-information',
      citation: '45 CFR 46.116(a)(5)(i)',
    });
    expect(report.findings[0].message).toBe(
      `Key information (45 CFR 46.116(a)(5)(i)) must begin the form, but the section "What the study is about and what you will do" comes before it. ` +
        `Move "Key information about this study" (line ${report.findings[0].line}) so it is the first section after the title.`,
    );
  });

  it('reports key information preceded by a long introduction under the title (45 CFR 46.116(a)(5)(i))', () => {
    const { head, sections } = sectionsOf(fullForm);
    const introduction = `${'This paragraph explains the lab and its history at length before the summary. '.repeat(6)}\n`;
    const report = checkRequiredElements(join(`${head}\n${introduction}`, sections));
    expect(report.findings.map((f) => f.code)).toEqual(['key-information-not-first']);
    expect(report.findings[0].message).toMatch(/but \d+ words of text come before it/);
  });

  it('reports a section that keeps its heading and marker but lost its text (45 CFR 46.116(b)(2))', () => {
    const { head, sections } = sectionsOf(fullForm);
    const emptied = sections.map((s) =>
      s.includes('<!-- element: b2 -->') ? '## Possible risks and discomforts\n<!-- element: b2 -->\n\nTBD.\n' : s,
    );
    const report = checkRequiredElements(join(head, emptied));
    expect(report.findings).toHaveLength(1);
    expect(report.findings[0]).toMatchObject({ code: 'empty-element', element: 'b2', citation: '45 CFR 46.116(b)(2)' });
    expect(report.findings[0].message).toMatch(
      /^Foreseeable risks and discomforts \(45 CFR 46\.116\(b\)\(2\)\): the section "Possible risks and discomforts" on line \d+ has almost no text\./,
    );
  });

  it('lists findings in the order key information, then (b)(1) to (b)(9)', () => {
    let form = fullForm;
    for (const id of ['b9', 'b3', 'key-information', 'b7']) form = withoutSection(form, id);
    expect(checkRequiredElements(form).findings.map((f) => f.citation)).toEqual([
      '45 CFR 46.116(a)(5)(i)',
      '45 CFR 46.116(b)(3)',
      '45 CFR 46.116(b)(7)',
      '45 CFR 46.116(b)(9)',
    ]);
  });

  it('recognises a hand-written form by its headings alone', () => {
    const sentence = 'This section says what it needs to say in plain words.';
    const headings = [
      'Summary',
      'Purpose and procedures',
      'Risks',
      'Benefits',
      'Alternatives',
      'Confidentiality',
      'Research-related injury',
      'Questions and contacts',
      'Voluntary participation',
      'Future use of your data',
    ];
    const form = `# Consent form\n\n${headings.map((h) => `## ${h}\n\n${sentence}\n`).join('\n')}`;
    const report = checkRequiredElements(form);
    expect(report.findings).toEqual([]);
    expect(report.required.every((e) => e.recognisedBy === 'heading')).toBe(true);
  });

  it('lets one marker name several elements', () => {
    const form =
      '# Form\n\n## Key information\n<!-- element: key-information -->\nA short summary of the whole study for you.\n\n## Everything else\n<!-- element: b1 b2 b3 b4 b5 b6 b7 b8 b9 -->\nOne long section that covers every element of the form in turn.\n';
    expect(checkRequiredElements(form).findings).toEqual([]);
  });

  it('reports study details still to fill and template placeholders, with their lines', () => {
    const { protocolNumber: _protocol, ...withoutProtocol } = wayfindingConsentFields;
    const report = checkRequiredElements(fillConsentTemplate(withoutProtocol));
    expect(report.findings.map((f) => f.code)).toEqual(['unfilled-placeholder']);
    expect(report.findings[0].message).toMatch(
      /^Line \d+ still says "\[to fill: ethics protocol number\]": replace it with the study's details\.$/,
    );

    const raw = checkRequiredElements(
      '# {{studyTitle}}\n\n## Key information\n<!-- element: key-information -->\nPay is {{totalPay}} for all steps together.\n',
    );
    expect(raw.findings.filter((f) => f.code === 'unfilled-placeholder').map((f) => [f.line, f.message])).toEqual([
      [1, 'Line 1 still has the template placeholder "{{studyTitle}}": replace it with the study\'s details.'],
      [5, 'Line 5 still has the template placeholder "{{totalPay}}": replace it with the study\'s details.'],
    ]);
  });

  it('reads Windows line endings the same way', () => {
    expect(checkRequiredElements(fullForm.replace(/\n/g, '\r\n')).findings).toEqual([]);
  });
});
