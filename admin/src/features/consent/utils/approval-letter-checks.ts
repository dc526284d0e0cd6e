/** The api's limit for an approval letter (MAX_APPROVAL_LETTER_BYTES in api/src/consent/consent.service.ts). */
export const maxApprovalLetterBytes = 10 * 1024 * 1024;

// Every PDF starts with "%PDF-" followed by the version (ISO 32000-1:2008, 7.5.2 "File header").
const pdfHeader = [0x25, 0x50, 0x44, 0x46, 0x2d];
export const pdfHeaderLength = pdfHeader.length;

export function startsLikePdf(firstBytes: Uint8Array): boolean {
  return pdfHeader.every((byte, index) => firstBytes[index] === byte);
}

/** Sizes the way people read them: bytes, KB or MB (1 KB = 1024 bytes, as file managers usually count). */
export function formatFileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(bytes < 10 * 1024 ? 1 : 0)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

/**
 * Why this file cannot be the approval letter, or null when it may be sent. The api checks the same again; this only
 * saves an upload that would be refused.
 */
export function approvalLetterProblem(file: { size: number }, firstBytes: Uint8Array): string | null {
  if (file.size === 0) return 'This file is empty. Choose the approval letter as a PDF.';
  if (file.size > maxApprovalLetterBytes) {
    return `This file (${formatFileSize(file.size)}) is larger than 10 MB, the most an approval letter may be.`;
  }
  if (!startsLikePdf(firstBytes))
    return 'This file is not a PDF (its content does not start like one, whatever its name). Choose the letter as a PDF.';
  return null;
}
