/**
 * What a consent form must contain, from 45 CFR 46.116 (the revised Common Rule, 2018 requirements): the key
 * information at the beginning (a)(5)(i), the nine basic elements (b)(1)–(9), and the additional elements of (c)
 * that a paid behavioural study usually needs. The requirement texts are our paraphrase of the regulation.
 *
 * A form marks each section with a comment on the line under its heading, e.g. `<!-- element: b2 -->` (several
 * ids may share one marker: `<!-- element: b2 b3 -->`). A section without a marker is recognised by its heading
 * wording instead, using the patterns below, so a form written by hand can still pass.
 */
export const REQUIRED_ELEMENT_IDS = ['key-information', 'b1', 'b2', 'b3', 'b4', 'b5', 'b6', 'b7', 'b8', 'b9'] as const;
export type RequiredElementId = (typeof REQUIRED_ELEMENT_IDS)[number];
export const OPTIONAL_ELEMENT_IDS = ['c2', 'c4', 'c6'] as const;
export type OptionalElementId = (typeof OPTIONAL_ELEMENT_IDS)[number];
export type ConsentElementId = RequiredElementId | OptionalElementId;

export interface ConsentElement {
  id: ConsentElementId;
  citation: string;
  name: string;
  /** What the section has to say, finishing the sentence "Add a section that …". */
  requirement: string;
  suggestedHeading: string;
  headingPatterns: RegExp[];
}

export const CONSENT_ELEMENTS: readonly ConsentElement[] = [
  {
    id: 'key-information',
    citation: '45 CFR 46.116(a)(5)(i)',
    name: 'Key information',
    requirement:
      'gives a concise, focused summary of what is most likely to help someone decide whether to take part, before anything else in the form',
    suggestedHeading: 'Key information about this study',
    headingPatterns: [
      /\bkey (information|facts|points)\b/,
      /\bat a glance\b/,
      /^(study )?summary$/,
      /\bconcise summary\b/,
    ],
  },
  {
    id: 'b1',
    citation: '45 CFR 46.116(b)(1)',
    name: 'Research statement, purpose, duration and procedures',
    requirement:
      'says the study is research and explains its purpose, how long taking part lasts, what participants will do, and which procedures, if any, are experimental',
    suggestedHeading: 'What the study is about and what you will do',
    headingPatterns: [
      /\bpurpose\b/,
      /\bprocedures?\b/,
      /\bwhat (the study|this study|the research) is about\b/,
      /\bwhat (you|i) will do\b/,
      /\bwhat will happen\b/,
      /\b(study|research) description\b/,
    ],
  },
  {
    id: 'b2',
    citation: '45 CFR 46.116(b)(2)',
    name: 'Foreseeable risks and discomforts',
    requirement: 'describes any reasonably foreseeable risks or discomforts of taking part',
    suggestedHeading: 'Possible risks and discomforts',
    headingPatterns: [/\brisks?\b/, /\bdiscomforts?\b/],
  },
  {
    id: 'b3',
    citation: '45 CFR 46.116(b)(3)',
    name: 'Benefits',
    requirement:
      'describes any benefits to the participant or to others that may reasonably be expected (pay is not counted as a benefit)',
    suggestedHeading: 'Possible benefits',
    headingPatterns: [/\bbenefits?\b/],
  },
  {
    id: 'b4',
    citation: '45 CFR 46.116(b)(4)',
    name: 'Alternatives',
    requirement:
      "discloses any appropriate alternative procedures or courses of treatment that might be to the participant's advantage (for most behavioural studies: simply not taking part)",
    suggestedHeading: 'Other choices you have',
    headingPatterns: [/\balternatives?\b/, /\bother (choices|options)\b/],
  },
  {
    id: 'b5',
    citation: '45 CFR 46.116(b)(5)',
    name: 'Confidentiality',
    requirement: 'describes to what extent records that identify the participant will be kept confidential',
    suggestedHeading: 'How we protect your information',
    headingPatterns: [
      /\bconfidential(ity)?\b/,
      /\bprivacy\b/,
      /\bprotect(ing|s)? your (information|data|privacy|records)\b/,
    ],
  },
  {
    id: 'b6',
    citation: '45 CFR 46.116(b)(6)',
    name: 'Compensation and treatment for injury',
    requirement:
      'explains whether compensation or medical treatment is available if injury occurs and where to find out more (the regulation asks for it when research is more than minimal risk; a minimal-risk form can say in a sentence what applies)',
    suggestedHeading: 'If you are harmed by taking part',
    headingPatterns: [/\binjur(y|ies|ed)\b/, /\bharm(ed)?\b/, /\bif you are hurt\b/],
  },
  {
    id: 'b7',
    citation: '45 CFR 46.116(b)(7)',
    name: 'Contacts for questions, rights and injury',
    requirement:
      "says whom to contact with questions about the research, about participants' rights, and in the event of a research-related injury",
    suggestedHeading: 'Whom to contact',
    headingPatterns: [/\bcontacts?\b/, /\bquestions\b/, /\bwho(m)? (to|can i) (ask|contact|call)\b/],
  },
  {
    id: 'b8',
    citation: '45 CFR 46.116(b)(8)',
    name: 'Voluntary participation',
    requirement:
      'states that taking part is voluntary, that refusing involves no penalty or loss of benefits, and that the participant may stop at any time without penalty or loss of benefits',
    suggestedHeading: 'Taking part is your choice',
    headingPatterns: [/\bvoluntar(y|ily)\b/, /\byour choice\b/, /\bright to (refuse|decline)\b/],
  },
  {
    id: 'b9',
    citation: '45 CFR 46.116(b)(9)',
    name: 'Future use of identifiable information',
    requirement:
      'states either that identifiers might be removed and the information then used or shared for future research without further consent, or that it will not be used or shared for future research even with identifiers removed',
    suggestedHeading: 'Use of your information in future research',
    headingPatterns: [/\bfuture (research|use|studies)\b/, /\bidentifiers?\b/],
  },
  {
    id: 'c2',
    citation: '45 CFR 46.116(c)(2)',
    name: 'Termination by the investigator',
    requirement: "describes when the investigator may end someone's participation without their consent",
    suggestedHeading: 'When the research team may end your participation',
    headingPatterns: [/\b(end|stop|terminate)s? (your|someone's) participation\b/, /\bremoved from the study\b/],
  },
  {
    id: 'c4',
    citation: '45 CFR 46.116(c)(4)',
    name: 'Consequences of withdrawal',
    requirement: 'describes the consequences of deciding to withdraw and how to withdraw in an orderly way',
    suggestedHeading: 'If you decide to stop',
    headingPatterns: [/\b(decide|choose) to (stop|withdraw)\b/, /\bwithdraw(al|ing)?\b/],
  },
  {
    id: 'c6',
    citation: '45 CFR 46.116(c)(6)',
    name: 'Approximate number of participants',
    requirement: 'states approximately how many people will take part',
    suggestedHeading: 'How many people will take part',
    headingPatterns: [/\bhow many (people|participants)\b/, /\bnumber of (people|participants|subjects)\b/],
  },
];

export function consentElement(id: ConsentElementId): ConsentElement {
  const element = CONSENT_ELEMENTS.find((e) => e.id === id);
  if (!element) throw new Error(`unknown consent element ${id}`);
  return element;
}
