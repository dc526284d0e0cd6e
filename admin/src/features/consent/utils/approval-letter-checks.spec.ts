import { describe, expect, it } from 'vitest';
import { approvalLetterProblem, formatFileSize, maxApprovalLetterBytes, startsLikePdf } from './approval-letter-checks';

const bytes = (...values: number[]) => new Uint8Array(values);
const ascii = (text: string) => new TextEncoder().encode(text);

describe('approval letter checks', () => {
  it('recognises a PDF by the "%PDF-" file header', () => {
    // ISO 32000-1:2008, 7.5.2: the first line of a PDF file is a header "%PDF-1.n".
    expect(startsLikePdf(ascii('%PDF-1.7\n'))).toBe(true);
    expect(startsLikePdf(ascii('%PDF-2.0\n'))).toBe(true);
  });

  it('refuses a PNG renamed to .pdf, by its content', () => {
    // PNG signature 89 50 4E 47 0D 0A 1A 0A (PNG specification, ISO/IEC 15948, 5.2).
    const png = bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a);
    expect(startsLikePdf(png)).toBe(false);
    expect(approvalLetterProblem({ size: 2048 }, png)).toMatch(/not a PDF/);
  });

  it('refuses a header that is cut short or only similar', () => {
    expect(startsLikePdf(ascii('%PDF'))).toBe(false);
    expect(startsLikePdf(ascii('%pdf-1.4'))).toBe(false);
    expect(startsLikePdf(ascii(' %PDF-1.4'))).toBe(false);
  });

  it('allows exactly 10 MB and refuses one byte more, as the api does', () => {
    // The api's limit is 10 × 1024 × 1024 bytes (MAX_APPROVAL_LETTER_BYTES).
    expect(maxApprovalLetterBytes).toBe(10_485_760);
    const header = ascii('%PDF-1.7');
    expect(approvalLetterProblem({ size: 10_485_760 }, header)).toBeNull();
    expect(approvalLetterProblem({ size: 10_485_761 }, header)).toBe(
      'This file (10.0 MB) is larger than 10 MB, the most an approval letter may be.',
    );
    expect(approvalLetterProblem({ size: 11 * 1024 * 1024 }, header)).toMatch(
      /^This file \(11\.0 MB\) is larger than 10 MB/,
    );
  });

  it('refuses an empty file before looking at its content', () => {
    expect(approvalLetterProblem({ size: 0 }, new Uint8Array())).toBe(
      'This file is empty. Choose the approval letter as a PDF.',
    );
  });

  it('writes sizes in binary units', () => {
    // Common practice: 1 KB = 1024 bytes in file size displays.
    expect(formatFileSize(1215)).toBe('1.2 KB');
    expect(formatFileSize(512)).toBe('512 bytes');
    expect(formatFileSize(300 * 1024)).toBe('300 KB');
    expect(formatFileSize(5 * 1024 * 1024)).toBe('5.0 MB');
  });
});
