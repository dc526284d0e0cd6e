// Reads a PDF's text back the way a viewer would, with Mozilla's pdf.js (legacy build, for Node).
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

export interface PdfTextPage {
  /** The page's text items joined, lines separated by "\n". */
  text: string;
}

export async function extractPdfText(
  bytes: Uint8Array,
): Promise<{ pages: PdfTextPage[]; info: Record<string, unknown> }> {
  // pdf.js takes ownership of the buffer it is given, so hand it a copy.
  const document = await getDocument({
    data: new Uint8Array(bytes),
    isEvalSupported: false,
    useSystemFonts: false,
    verbosity: 0,
  }).promise;
  const pages: PdfTextPage[] = [];
  for (let number = 1; number <= document.numPages; number += 1) {
    const page = await document.getPage(number);
    const content = await page.getTextContent();
    let text = '';
    for (const item of content.items) {
      if (!('str' in item)) continue;
      text += item.str;
      if (item.hasEOL) text += '\n';
    }
    pages.push({ text });
  }
  const metadata = await document.getMetadata();
  await document.destroy();
  return { pages, info: metadata.info as Record<string, unknown> };
}
