/**
 * The signed copy of a consent form (45 CFR 46.117(a): the signer receives a copy): the full text as signed, a
 * signature block with the printed name, the date and time with the time zone, and the meaning of the signature
 * (21 CFR 11.50), the text fingerprint, the drawn mark if any, and, as the form's last section, a record of the signing with every fact an
 * auditor needs.
 *
 * The output is deterministic: the same input gives the same bytes, so its SHA-256 can be stored and re-checked.
 * The document dates come from the input, font subsets get fixed names instead of pdf-lib's random tags, and
 * nothing reads the clock.
 *
 * With a signing identity the file is also sealed: a PDF digital signature (detached PKCS#7/CMS over the byte
 * ranges, adbe.pkcs7.detached) made with the lab's certificate, so any PDF reader shows a change to the file. The
 * signing time is the issue time and RSA PKCS#1 v1.5 signatures are deterministic, so sealed output is too.
 */
import fontkit from '@pdf-lib/fontkit';
import { fonts as shippedFonts } from '@evenhand/legal-templates';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { pdflibAddPlaceholder } from '@signpdf/placeholder-pdf-lib';
import { P12Signer } from '@signpdf/signer-p12';
import { SignPdf } from '@signpdf/signpdf';
import { PDFDocument, PDFImage } from 'pdf-lib';
import { consentTextBlocks, TextRun } from '../consent-markdown';
import { isFingerprint, renderedTextFingerprint } from '../consent-text';
import { describeSigningTime } from '../study-formatting';
import type { FieldError } from '../consent-error';
import { DocumentError, DocumentErrorCode } from './document-error';
import { MARGIN, MUTED, PdfWriter, RULE, TextStyle } from './pdf-layout';

export interface SignedConsentPdfInput {
  /** The rendered consent text exactly as signed (renderedConsentText's output). */
  consentText: string;
  /** Its fingerprint as stored on the consent version; must match the text. */
  textFingerprint: string;
  studyTitle: string;
  labName: string;
  formVersion: number;
  consentVersionId: string;
  ethicsApprovalReference: string;
  /** The date the ethics board approved this version, YYYY-MM-DD. */
  ethicsApprovedOn: string;
  enrollmentReference: string;
  signatureId?: string | null;
  signer: {
    typedName: string;
    signedAt: Date;
    /** The signer's IANA time zone as their browser reported it; UTC when unknown. */
    timeZone?: string | null;
    /** What the signature means, as shown beside the button. */
    meaning: string;
    /** A PNG data URL from the signature pad, when the signer drew a mark. */
    markPngDataUrl?: string | null;
    ipAddress: string;
    userAgent: string;
  };
  /** The PDF's creation and modification date; the signing time when omitted. */
  issuedAt?: Date;
}

/** The lab's document-signing identity (see signing-certificate.ts). */
export interface PdfSealIdentity {
  p12: Uint8Array;
  passphrase: string;
}

export interface SignedConsentPdf {
  bytes: Uint8Array;
  /** SHA-256 of `bytes`, 64 lowercase hex characters. */
  sha256: string;
  /** Whether `bytes` carry a PDF digital signature. */
  sealed: boolean;
  pageCount: number;
  /** SHA-256 of the drawn mark's PNG bytes, when there is one. */
  markSha256: string | null;
  /** Characters the shipped font cannot show (drawn as blank boxes); empty for Latin, Greek and Cyrillic text. */
  unsupportedCharacters: string[];
}

export const MAX_MARK_BYTES = 512 * 1024;
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

const BODY: TextStyle = { size: 10.5, lineHeight: 15 };
const SMALL: TextStyle = { size: 8.5, lineHeight: 12, color: MUTED };
const LABEL: TextStyle = { size: 8.5, lineHeight: 12, color: MUTED, bold: true };
const HEADINGS: Record<number, TextStyle & { before: number; after: number }> = {
  1: { size: 17, lineHeight: 22, bold: true, before: 0, after: 10 },
  2: { size: 12.5, lineHeight: 17, bold: true, before: 12, after: 4 },
  3: { size: 11, lineHeight: 15, bold: true, before: 8, after: 3 },
};
const LIST_INDENT = 18;
const FIELD_WIDTH_INSET = 24;
const NAME: TextStyle = { size: 12, lineHeight: 16, bold: true };
const FINGERPRINT: TextStyle = { size: 9.5, lineHeight: 13 };
const SIGNED_ELECTRONICALLY =
  'Signed electronically by typing the full name above and confirming with the button whose meaning is stated above.';

let fontBytes: { regular: Uint8Array; bold: Uint8Array } | null = null;
function shippedFontBytes() {
  fontBytes ??= { regular: readFileSync(shippedFonts.regular), bold: readFileSync(shippedFonts.bold) };
  return fontBytes;
}

const run = (text: string, bold = false): TextRun[] => [{ text, bold }];

function validate(input: SignedConsentPdfInput): { markBytes: Uint8Array | null } {
  const errors: FieldError[] = [];
  const need = (value: unknown, field: string) => {
    if (typeof value !== 'string' || value.trim() === '') errors.push({ field, message: 'is required' });
  };
  need(input?.consentText, 'consentText');
  need(input?.studyTitle, 'studyTitle');
  need(input?.labName, 'labName');
  need(input?.consentVersionId, 'consentVersionId');
  need(input?.ethicsApprovalReference, 'ethicsApprovalReference');
  need(input?.enrollmentReference, 'enrollmentReference');
  need(input?.signer?.typedName, 'signer.typedName');
  need(input?.signer?.meaning, 'signer.meaning');
  need(input?.signer?.ipAddress, 'signer.ipAddress');
  need(input?.signer?.userAgent, 'signer.userAgent');
  if (!Number.isSafeInteger(input?.formVersion) || input.formVersion < 1)
    errors.push({ field: 'formVersion', message: 'must be a whole number ≥ 1' });
  if (
    typeof input?.ethicsApprovedOn !== 'string' ||
    !/^\d{4}-\d{2}-\d{2}$/.test(input.ethicsApprovedOn) ||
    Number.isNaN(Date.parse(input.ethicsApprovedOn))
  ) {
    errors.push({ field: 'ethicsApprovedOn', message: 'must be a date written YYYY-MM-DD' });
  }
  if (!(input?.signer?.signedAt instanceof Date) || Number.isNaN(input.signer.signedAt.getTime()))
    errors.push({ field: 'signer.signedAt', message: 'must be a valid date and time' });
  if (input?.issuedAt !== undefined && (!(input.issuedAt instanceof Date) || Number.isNaN(input.issuedAt.getTime())))
    errors.push({ field: 'issuedAt', message: 'must be a valid date and time' });
  if (!isFingerprint(input?.textFingerprint)) {
    errors.push({ field: 'textFingerprint', message: 'must be 64 lowercase hex characters (SHA-256)' });
  } else if (typeof input.consentText === 'string' && input.consentText.trim() !== '') {
    let actual: string | null = null;
    try {
      actual = renderedTextFingerprint(input.consentText);
    } catch {
      errors.push({
        field: 'consentText',
        message: 'is not in rendered form: pass the stored rendered text, not the draft',
      });
    }
    if (actual !== null && actual !== input.textFingerprint)
      errors.push({ field: 'textFingerprint', message: `does not match the text (the text hashes to ${actual})` });
  }

  let markBytes: Uint8Array | null = null;
  const mark = input?.signer?.markPngDataUrl;
  if (mark !== undefined && mark !== null) {
    const match = typeof mark === 'string' ? /^data:image\/png;base64,([A-Za-z0-9+/]+={0,2})$/.exec(mark) : null;
    if (!match) {
      errors.push({ field: 'signer.markPngDataUrl', message: 'must be a PNG data URL (data:image/png;base64,…)' });
    } else {
      markBytes = Buffer.from(match[1], 'base64');
      if (markBytes.length > MAX_MARK_BYTES)
        errors.push({
          field: 'signer.markPngDataUrl',
          message: `must be at most ${MAX_MARK_BYTES / 1024} KB, got ${Math.ceil(markBytes.length / 1024)} KB`,
        });
      else if (!PNG_SIGNATURE.every((byte, i) => markBytes?.[i] === byte))
        errors.push({
          field: 'signer.markPngDataUrl',
          message: 'is not a PNG image (its first bytes are not the PNG signature)',
        });
    }
  }
  if (errors.length > 0) throw new DocumentError(DocumentErrorCode.InvalidInput, errors);
  return { markBytes };
}

function unsupportedCharacters(texts: string[], bytes: Uint8Array): string[] {
  const font = fontkit.create(bytes);
  const missing = new Set<string>();
  for (const text of texts) {
    for (const char of text) {
      const codePoint = char.codePointAt(0) ?? 0;
      if (codePoint >= 0x20 && !font.hasGlyphForCodePoint(codePoint)) missing.add(char);
    }
  }
  return [...missing];
}

export async function buildSignedConsentPdf(
  input: SignedConsentPdfInput,
  seal?: PdfSealIdentity,
): Promise<SignedConsentPdf> {
  const { markBytes } = validate(input);
  const { signer } = input;
  const time = describeSigningTime(signer.signedAt, signer.timeZone?.trim() || 'UTC', 'signer.signedAt');
  const issuedAt = input.issuedAt ?? signer.signedAt;
  const markSha256 = markBytes ? createHash('sha256').update(markBytes).digest('hex') : null;

  const doc = await PDFDocument.create({ updateMetadata: false });
  doc.registerFontkit(fontkit);
  const bytesOfFonts = shippedFontBytes();
  // Fixed subset tags (six capitals + "+", as the PDF format names subsets) keep the bytes reproducible.
  const regular = await doc.embedFont(bytesOfFonts.regular, { subset: true, customName: 'EVHREG+DejaVuSans' });
  const bold = await doc.embedFont(bytesOfFonts.bold, { subset: true, customName: 'EVHBLD+DejaVuSans-Bold' });
  let markImage: PDFImage | null = null;
  if (markBytes) {
    try {
      markImage = await doc.embedPng(markBytes);
    } catch (error: unknown) {
      throw new DocumentError(DocumentErrorCode.InvalidInput, [
        {
          field: 'signer.markPngDataUrl',
          message: `is not a readable PNG image (${error instanceof Error ? error.message : String(error)})`,
        },
      ]);
    }
  }

  doc.setTitle(`Signed consent form: ${input.studyTitle} (version ${input.formVersion})`, {
    showInWindowTitleBar: true,
  });
  doc.setAuthor(input.labName);
  doc.setSubject(`Signed by ${signer.typedName} on ${time.utc}`);
  doc.setCreator('Evenhand');
  doc.setProducer('Evenhand (pdf-lib)');
  doc.setLanguage('en');
  doc.setCreationDate(issuedAt);
  doc.setModificationDate(issuedAt);

  const writer = new PdfWriter(doc, { regular, bold });

  // A line above the form says what this copy is.
  writer.text(run(`Signed copy of a consent form · ${input.labName} · form version ${input.formVersion}`), SMALL);
  writer.gap(10);

  let afterListItem = false;
  for (const block of consentTextBlocks(input.consentText)) {
    const isListItem = block.kind === 'paragraph' && block.depth > 0;
    if (afterListItem && !isListItem) writer.gap(5);
    afterListItem = isListItem;
    if (block.kind === 'rule') {
      writer.rule();
    } else if (block.kind === 'heading') {
      const style = HEADINGS[Math.min(block.level, 3)];
      if (writer.y !== writer.top) writer.gap(style.before);
      // Keep a heading with the first two lines of what follows it.
      writer.ensure(writer.height(block.runs, style) + 2 * BODY.lineHeight);
      writer.text(block.runs, style);
      writer.gap(style.after);
    } else {
      const indent = block.depth > 0 ? LIST_INDENT * block.depth : 0;
      writer.text(block.runs, BODY, MARGIN.left + indent, writer.width - indent, block.marker ?? undefined);
      writer.gap(isListItem ? 3 : 7);
    }
  }

  drawSignatureBlock(writer, input, time.text, markImage);
  drawSigningRecord(writer, input, { time, markSha256, issuedAt });
  writer.footers(`${input.studyTitle} · consent form version ${input.formVersion} · signed by ${signer.typedName}`);

  let bytes: Uint8Array;
  if (seal) {
    pdflibAddPlaceholder({
      pdfDoc: doc,
      reason: `Signed copy of consent form version ${input.formVersion} for ${input.enrollmentReference}`,
      contactInfo: input.labName,
      name: input.labName,
      location: input.labName,
      signingTime: issuedAt,
      appName: 'Evenhand',
    });
    // The placeholder's byte ranges are found in the file's text, which object streams would compress away.
    const unsigned = await doc.save({ useObjectStreams: false });
    const signed = await new SignPdf().sign(
      Buffer.from(unsigned),
      new P12Signer(Buffer.from(seal.p12), { passphrase: seal.passphrase }),
      issuedAt,
    );
    bytes = new Uint8Array(signed);
  } else {
    bytes = await doc.save({ useObjectStreams: true });
  }
  return {
    bytes,
    sealed: Boolean(seal),
    sha256: createHash('sha256').update(bytes).digest('hex'),
    pageCount: doc.getPageCount(),
    markSha256,
    unsupportedCharacters: unsupportedCharacters(
      [input.consentText, signer.typedName, signer.meaning, input.studyTitle, input.labName],
      bytesOfFonts.regular,
    ),
  };
}

function fieldHeight(writer: PdfWriter, value: string, valueStyle: TextStyle): number {
  return LABEL.lineHeight + writer.height(run(value), valueStyle, writer.width - FIELD_WIDTH_INSET) + 5;
}

function field(writer: PdfWriter, label: string, value: string, valueStyle: TextStyle = BODY): void {
  writer.text(run(label), LABEL, MARGIN.left + 12, writer.width - FIELD_WIDTH_INSET);
  writer.text(run(value), valueStyle, MARGIN.left + 12, writer.width - FIELD_WIDTH_INSET);
  writer.gap(5);
}

function drawSignatureBlock(
  writer: PdfWriter,
  input: SignedConsentPdfInput,
  signedAtText: string,
  mark: PDFImage | null,
): void {
  const markSize = mark ? mark.scaleToFit(220, 70) : null;
  const markHeight = markSize ? LABEL.lineHeight + 4 + markSize.height + 4 + 9 : 0;
  const height =
    12 +
    17 +
    6 +
    fieldHeight(writer, input.signer.typedName, NAME) +
    fieldHeight(writer, signedAtText, BODY) +
    fieldHeight(writer, input.signer.meaning, BODY) +
    markHeight +
    fieldHeight(writer, input.textFingerprint, FINGERPRINT) +
    writer.height(run(SIGNED_ELECTRONICALLY), SMALL, writer.width - FIELD_WIDTH_INSET) +
    10;
  writer.gap(14);
  // The whole block stays on one page, so the box around it is drawn once.
  writer.ensure(height);
  const top = writer.y;
  writer.gap(12);
  writer.text(
    run('Signature', true),
    { size: 12.5, lineHeight: 17 },
    MARGIN.left + 12,
    writer.width - FIELD_WIDTH_INSET,
  );
  writer.gap(6);
  field(writer, 'PRINTED NAME OF THE SIGNER', input.signer.typedName, NAME);
  field(writer, 'DATE AND TIME SIGNED', signedAtText);
  field(writer, 'MEANING OF THIS SIGNATURE', input.signer.meaning);
  if (mark && markSize) {
    writer.text(run('DRAWN MARK'), LABEL, MARGIN.left + 12, writer.width - FIELD_WIDTH_INSET);
    writer.gap(4);
    writer.page.drawImage(mark, {
      x: MARGIN.left + 12,
      y: writer.y - markSize.height,
      width: markSize.width,
      height: markSize.height,
    });
    writer.gap(markSize.height + 4);
    writer.page.drawLine({
      start: { x: MARGIN.left + 12, y: writer.y },
      end: { x: MARGIN.left + 12 + 240, y: writer.y },
      thickness: 0.6,
      color: MUTED,
    });
    writer.gap(9);
  }
  field(writer, 'FORM TEXT FINGERPRINT (SHA-256)', input.textFingerprint, FINGERPRINT);
  writer.text(run(SIGNED_ELECTRONICALLY), SMALL, MARGIN.left + 12, writer.width - FIELD_WIDTH_INSET);
  writer.gap(10);
  writer.page.drawRectangle({
    x: MARGIN.left,
    y: writer.y,
    width: writer.width,
    height: top - writer.y,
    borderColor: RULE,
    borderWidth: 0.8,
  });
}

/**
 * The form's last section: a record of this signing, in sentences, continuing the form rather than on a page of
 * its own. It carries every fact an auditor needs: the form and its approval, who signed and what the signature
 * means, the time with its zone, where it came from (network address, browser) and the fingerprints.
 */
function drawSigningRecord(
  writer: PdfWriter,
  input: SignedConsentPdfInput,
  facts: { time: ReturnType<typeof describeSigningTime>; markSha256: string | null; issuedAt: Date },
): void {
  const { signer } = input;
  const heading = HEADINGS[2];
  writer.gap(18);
  writer.ensure(heading.lineHeight + 3 * BODY.lineHeight);
  writer.rule();
  writer.gap(6);
  writer.text(run('Record of this signing'), heading);
  writer.gap(heading.after);
  writer.text(
    run(`Written by ${input.labName} at the moment of signing, and part of this signed copy like the form above.`),
    { ...BODY, color: MUTED },
  );
  writer.gap(8);
  const signatureRecord = input.signatureId ? ` (signature record ${input.signatureId})` : '';
  const items: Array<[string, string]> = [
    [
      'The form. ',
      `${input.studyTitle}, run by ${input.labName}: consent form version ${input.formVersion} (id ${input.consentVersionId}), approved by the ethics board under reference ${input.ethicsApprovalReference} on ${input.ethicsApprovedOn}.`,
    ],
    [
      'Who signed, and what it means. ',
      `${signer.typedName} signed as enrollment ${input.enrollmentReference}${signatureRecord}, with this meaning: “${signer.meaning}”`,
    ],
    [
      'When. ',
      `${facts.time.local} in ${facts.time.timeZone} (${facts.time.offset}), which is ${facts.time.iso} in UTC.`,
    ],
    [
      'From where. ',
      `From network address ${signer.ipAddress}, in a browser that described itself as: ${signer.userAgent}`,
    ],
  ];
  items.forEach(([lead, text], index) => {
    const runs = [{ text: lead, bold: true }, ...run(text)];
    // Each item stays on one page, so it reads as one statement.
    writer.ensure(writer.height(runs, BODY, writer.width - LIST_INDENT));
    writer.text(runs, BODY, MARGIN.left + LIST_INDENT, writer.width - LIST_INDENT, `${index + 1}.`);
    writer.gap(5);
  });
  // A fingerprint is one unbroken string: each gets its own line under the item.
  writer.ensure(BODY.lineHeight + 2 * FINGERPRINT.lineHeight + 10);
  writer.text(
    [
      { text: 'Fingerprints (SHA-256). ', bold: true },
      ...run('The consent text exactly as signed, and the drawn mark.'),
    ],
    BODY,
    MARGIN.left + LIST_INDENT,
    writer.width - LIST_INDENT,
    `${items.length + 1}.`,
  );
  writer.gap(2);
  writer.text(
    run(`Form text: ${input.textFingerprint}`),
    FINGERPRINT,
    MARGIN.left + LIST_INDENT,
    writer.width - LIST_INDENT,
  );
  writer.text(
    run(`Drawn mark: ${facts.markSha256 ?? 'none was drawn'}`),
    FINGERPRINT,
    MARGIN.left + LIST_INDENT,
    writer.width - LIST_INDENT,
  );
  writer.gap(5);
  const checking = [
    { text: 'Checking this copy. ', bold: true },
    ...run(
      `This copy was issued at ${facts.issuedAt.toISOString()}. The form text fingerprint is the SHA-256 of the consent text as stored for this form version (UTF-8, line feeds); ` +
        `recomputing it must give the value above. ${input.labName} keeps the SHA-256 of this PDF file with the signature, and the file carries a digital signature made with the lab's certificate, so a PDF reader shows any change made after signing.`,
    ),
  ];
  writer.ensure(writer.height(checking, BODY, writer.width - LIST_INDENT));
  writer.text(checking, BODY, MARGIN.left + LIST_INDENT, writer.width - LIST_INDENT, `${items.length + 2}.`);
}
