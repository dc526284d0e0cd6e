export type ConsentSection = { id: string; heading: string; html: string };
export type ReadingPage = { id: string; heading: string; html: string; isKeyInformation: boolean };

/**
 * The screens a person reads before signing: the key information first, on its own, then the full form section
 * by section. The form's first section is the key information; when it is the very same text it is not shown
 * twice, otherwise nothing of the signed form is left out.
 */
export function readingPages(consent: { keyInformationHtml: string; sections: ConsentSection[] }): ReadingPage[] {
  const [first, ...rest] = consent.sections;
  const keyInformation: ReadingPage = {
    id: 'key-information',
    heading: first?.heading || 'Key information',
    html: consent.keyInformationHtml,
    isKeyInformation: true,
  };
  const fullForm = first && first.html.trim() !== consent.keyInformationHtml.trim() ? consent.sections : rest;
  return [keyInformation, ...fullForm.map((section) => ({ ...section, isKeyInformation: false }))];
}

/** A remembered position is used only when it still fits the form (pages plus the signature screen). */
export function clampedPosition(stored: unknown, screens: number): number {
  if (typeof stored !== 'number' || !Number.isInteger(stored) || stored < 0) return 0;
  return Math.min(stored, screens - 1);
}
