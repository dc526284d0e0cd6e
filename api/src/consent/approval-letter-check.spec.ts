import { PDFDocument } from 'pdf-lib';
import { describe, expect, it } from 'vitest';
import { approvalLetterProblem } from './approval-letter-check';

/** A hand-written one-page PDF without a cross-reference table, as small as a real letter can be. */
const ONE_PAGE = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n' +
    '3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 612 792]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
  'latin1',
);

describe('approvalLetterProblem', () => {
  it('accepts a PDF that loads with a page', async () => {
    const made = await PDFDocument.create();
    made.addPage();
    expect(await approvalLetterProblem(Buffer.from(await made.save()), 'letter.pdf')).toBeNull();
    expect(await approvalLetterProblem(ONE_PAGE, 'letter.pdf')).toBeNull();
  });

  it('refuses a file that only starts like a PDF', async () => {
    expect(
      await approvalLetterProblem(Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(4000, 0x41)]), 'x.pdf'),
    ).toMatchObject({ field: 'letter' });
    expect(
      await approvalLetterProblem(Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n', 'latin1'), 'x.pdf'),
    ).toMatchObject({ field: 'letter' });
  });

  it('refuses a PDF without pages, a non-PDF and an unstorable file name', async () => {
    const empty = await PDFDocument.create();
    expect(
      await approvalLetterProblem(Buffer.from(await empty.save({ addDefaultPage: false })), 'x.pdf'),
    ).toMatchObject({ message: expect.stringMatching(/without any page/) });
    expect(await approvalLetterProblem(Buffer.from('hello'), 'x.pdf')).toMatchObject({ field: 'letter' });
    expect(await approvalLetterProblem(ONE_PAGE, 'x\u0000.pdf')).toMatchObject({ field: 'letter' });
  });
});
