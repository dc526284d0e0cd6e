import { PDFDocument } from 'pdf-lib';
import { isUnstorableText } from '../common/http/request-hygiene';

/**
 * Why an uploaded approval letter is not a usable PDF, or null when it is: it must load as a PDF document with at
 * least one page (the first bytes alone prove nothing), and its file name must be text we can store. Encrypted
 * letters are accepted: only their contents are encrypted, not the page tree.
 */
export async function approvalLetterProblem(
  bytes: Buffer,
  fileName: string,
): Promise<{ field: string; message: string } | null> {
  if (isUnstorableText(fileName))
    return { field: 'letter', message: 'has a file name with a NUL character or an unpaired surrogate' };
  if (bytes.subarray(0, 5).toString('latin1') !== '%PDF-') {
    return { field: 'letter', message: 'is not a PDF (its content does not start like one, whatever its name)' };
  }
  try {
    const document = await PDFDocument.load(bytes, {
      ignoreEncryption: true,
      updateMetadata: false,
      throwOnInvalidObject: true,
    });
    if (document.getPageCount() < 1) return { field: 'letter', message: 'is a PDF without any page' };
    return null;
  } catch {
    return { field: 'letter', message: 'is not a readable PDF (it starts like one but does not load)' };
  }
}
