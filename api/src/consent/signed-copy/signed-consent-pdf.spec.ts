import { createHash } from 'node:crypto';
import { PNG } from 'pngjs';
import { beforeAll, describe, expect, it } from 'vitest';
import { wayfindingConsentFields } from '../consent-fields.fixture';
import { fillConsentTemplate } from '../consent-template';
import { renderedConsentText, renderedTextFingerprint } from '../consent-text';
import { DocumentError } from './document-error';
import { extractPdfText } from './pdf-text.fixture';
import { buildSignedConsentPdf, SignedConsentPdf, SignedConsentPdfInput } from './signed-consent-pdf';

/** A drawn mark as a signature pad would send it: a dark stroke on a transparent background. */
function drawnMarkDataUrl(): string {
  const png = new PNG({ width: 300, height: 100 });
  for (let x = 10; x < 290; x += 1) {
    const y = Math.round(50 + 30 * Math.sin(x / 22) * Math.cos(x / 57));
    for (let dy = -2; dy <= 2; dy += 1) {
      const offset = ((y + dy) * png.width + x) * 4;
      png.data.set([20, 30, 90, 255], offset);
    }
  }
  return `data:image/png;base64,${PNG.sync.write(png).toString('base64')}`;
}

const consentText = renderedConsentText(
  fillConsentTemplate({
    ...wayfindingConsentFields,
    // Accents and punctuation the font must show: – — ’ “ ” ≥ ≤ € £
    investigatorName: 'Dr. Zoë Ångström-Núñez',
    studyPurpose:
      'We test whether “sound” cues – or map cues — help people ≥ 18 find their way; it’s ≤ 1 hour, paid in €, £ or $.',
  }),
);

function input(overrides: Partial<SignedConsentPdfInput> = {}): SignedConsentPdfInput {
  return {
    consentText,
    textFingerprint: renderedTextFingerprint(consentText),
    studyTitle: 'Wayfinding cues',
    labName: 'Harbor Lane Cognition Lab',
    formVersion: 2,
    consentVersionId: '6f1c2b8e-0d3a-4c5e-9b7a-2e4d6f8a0c1b',
    ethicsApprovalReference: 'HLREB-2025-031',
    ethicsApprovedOn: '2025-02-20',
    enrollmentReference: 'ENR-7Q4K-2M9D',
    signatureId: 'b3e1f0a2-7c4d-4e6f-8a9b-0c1d2e3f4a5b',
    signer: {
      typedName: 'Maëlle Ó Súilleabháin-Øvergård',
      signedAt: new Date('2025-03-14T09:26:53.000Z'),
      timeZone: 'Europe/Berlin',
      meaning: 'I have read this form and agree to take part',
      markPngDataUrl: drawnMarkDataUrl(),
      ipAddress: '203.0.113.24',
      userAgent:
        'Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Safari/537.36',
    },
    ...overrides,
  };
}

describe(
  'buildSignedConsentPdf (45 CFR 46.117(a) signed copy; 21 CFR 11.50 signature manifestation)',
  { timeout: 30_000 },
  () => {
    let pdf: SignedConsentPdf;
    let pages: { text: string }[];
    beforeAll(async () => {
      pdf = await buildSignedConsentPdf(input());
      pages = (await extractPdfText(pdf.bytes)).pages;
    }, 60_000);

    it('prints the printed name, the date and time with time zone, the meaning and the fingerprint, read back with pdf.js', () => {
      const all = pages.map((p) => p.text).join('\n');
      const fingerprint = renderedTextFingerprint(consentText);

      const signaturePage = pages.find((p) => p.text.includes('PRINTED NAME OF THE SIGNER'));
      expect(signaturePage).toBeDefined();
      expect(signaturePage?.text).toContain('Maëlle Ó Súilleabháin-Øvergård');
      // 09:26:53 UTC is 10:26:53 in Berlin in March (CET, UTC+01:00; summer time starts on 30 March 2025).
      expect(signaturePage?.text).toContain('2025-03-14 09:26:53 UTC (10:26:53 in Europe/Berlin, UTC+01:00)');
      expect(signaturePage?.text).toContain('MEANING OF THIS SIGNATURE\nI have read this form and agree to take part');
      expect(signaturePage?.text).toContain(fingerprint);
      expect(signaturePage?.text).toContain('DRAWN MARK');
      expect(all).toContain('Page 1 of');
    });

    it('contains the full text as signed, headings included', () => {
      const all = pages
        .map((p) => p.text)
        .join(' ')
        .replace(/\s+/g, ' ');
      for (const heading of [
        'Key information about this study',
        'Possible risks and discomforts',
        'Whom to contact',
        'Use of your information in future research',
        'Payment terms',
      ]) {
        expect(all).toContain(heading);
      }
      expect(all).toContain(
        'Taking part is voluntary. If you decide not to take part, you lose nothing you would otherwise have, and there is no penalty.',
      );
    });

    it('shows accented letters and typographic punctuation as text (the shipped DejaVu Sans covers them)', () => {
      expect(pdf.unsupportedCharacters).toEqual([]);
      const all = pages
        .map((p) => p.text)
        .join(' ')
        .replace(/\s+/g, ' ');
      expect(all).toContain('Dr. Zoë Ångström-Núñez');
      expect(all).toContain(
        'We test whether “sound” cues – or map cues — help people ≥ 18 find their way; it’s ≤ 1 hour, paid in €, £ or $.',
      );
    });

    it('reports characters the shipped font cannot show, so the caller can flag the copy', async () => {
      // DejaVu Sans has no CJK ideographs (its coverage list: Latin, Greek, Cyrillic, Armenian, Georgian, Hebrew, Arabic…).
      const other = await buildSignedConsentPdf(
        input({ signer: { ...input().signer, typedName: 'Wang 王小明', markPngDataUrl: null } }),
      );
      expect(other.unsupportedCharacters).toEqual(['王', '小', '明']);
    });

    it("ends with a signing record written as the form's last section: every fact, in sentences of our own", () => {
      const all = pages.map((p) => p.text).join('\n');
      const record = all.slice(all.indexOf('Record of this signing'));
      const flat = record.replace(/\n/g, ' ');
      expect(all).not.toContain('Signature certificate');
      expect(all.indexOf('Record of this signing')).toBeGreaterThan(all.indexOf('MEANING OF THIS SIGNATURE'));
      expect(flat).toContain('consent form version 2 (id 6f1c2b8e-0d3a-4c5e-9b7a-2e4d6f8a0c1b)');
      expect(flat).toContain('under reference HLREB-2025-031 on 2025-02-20');
      expect(flat).toContain('Maëlle Ó Súilleabháin-Øvergård signed as enrollment ENR-7Q4K-2M9D');
      expect(flat).toContain('“I have read this form and agree to take part');
      expect(flat).toContain(
        '2025-03-14 10:26:53 in Europe/Berlin (UTC+01:00), which is 2025-03-14T09:26:53.000Z in UTC',
      );
      expect(flat).toContain('network address 203.0.113.24');
      expect(flat.replace(/ /g, '')).toContain(input().signer.userAgent.replace(/ /g, ''));
      expect(flat).toContain(`Form text: ${renderedTextFingerprint(consentText)}`);
      const markPng = Buffer.from(input().signer.markPngDataUrl!.split(',')[1], 'base64');
      expect(pdf.markSha256).toBe(createHash('sha256').update(markPng).digest('hex'));
      expect(flat).toContain(`Drawn mark: ${pdf.markSha256}`);
      expect(flat).toContain('This copy was issued at 2025-03-14T09:26:53.000Z');
      expect(pages.length).toBe(pdf.pageCount);
    });

    it('returns the SHA-256 of exactly the bytes it returns, and the same bytes for the same input', async () => {
      const first = pdf;
      expect(first.sha256).toBe(createHash('sha256').update(first.bytes).digest('hex'));
      const second = await buildSignedConsentPdf(input());
      expect(Buffer.from(second.bytes).equals(Buffer.from(first.bytes))).toBe(true);
      expect(second.sha256).toBe(first.sha256);
      const other = await buildSignedConsentPdf(input({ enrollmentReference: 'ENR-7Q4K-2M9E' }));
      expect(other.sha256).not.toBe(first.sha256);
    });

    it('sets the document dates from the input, not the clock', async () => {
      const issued = await buildSignedConsentPdf(input({ issuedAt: new Date('2025-03-14T09:27:10Z') }));
      const { info } = await extractPdfText(issued.bytes);
      expect(info.CreationDate).toBe('D:20250314092710Z');
      expect(info.ModDate).toBe('D:20250314092710Z');
      expect(info.Title).toBe('Signed consent form: Wayfinding cues (version 2)');
    });

    it('works without a drawn mark and says so in the signing record', async () => {
      const unmarked = await buildSignedConsentPdf(input({ signer: { ...input().signer, markPngDataUrl: null } }));
      const unmarkedPages = (await extractPdfText(unmarked.bytes)).pages;
      expect(unmarkedPages.map((p) => p.text).join('\n')).not.toContain('DRAWN MARK');
      expect(unmarkedPages[unmarkedPages.length - 1].text.replace(/\n/g, ' ')).toContain('Drawn mark: none was drawn');
      expect(unmarked.markSha256).toBeNull();
    });

    it('refuses a fingerprint that does not match the text, naming the field', async () => {
      await expect(buildSignedConsentPdf(input({ textFingerprint: '0'.repeat(64) }))).rejects.toThrow(
        /^textFingerprint: does not match the text/,
      );
    });

    it('refuses bad input with every field at fault', async () => {
      const bad = input({
        formVersion: 0,
        ethicsApprovedOn: '20 Feb 2025',
        signer: {
          ...input().signer,
          typedName: ' ',
          signedAt: new Date('x'),
          markPngDataUrl: 'data:image/jpeg;base64,AAAA',
        },
      });
      const error = await buildSignedConsentPdf(bad).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(DocumentError);
      expect((error as DocumentError).fieldErrors.map((e) => e.field)).toEqual([
        'signer.typedName',
        'formVersion',
        'ethicsApprovedOn',
        'signer.signedAt',
        'signer.markPngDataUrl',
      ]);
    });

    it('refuses a mark that is not a PNG or is too large', async () => {
      const notPng = `data:image/png;base64,${Buffer.from('GIF89a not a png at all').toString('base64')}`;
      await expect(
        buildSignedConsentPdf(input({ signer: { ...input().signer, markPngDataUrl: notPng } })),
      ).rejects.toThrow('signer.markPngDataUrl: is not a PNG image');
      const huge = `data:image/png;base64,${Buffer.alloc(600 * 1024, 1).toString('base64')}`;
      await expect(
        buildSignedConsentPdf(input({ signer: { ...input().signer, markPngDataUrl: huge } })),
      ).rejects.toThrow(/^signer\.markPngDataUrl: must be at most 512 KB/);
    });

    it('refuses the raw draft in place of the rendered text', async () => {
      const draft = fillConsentTemplate(wayfindingConsentFields);
      await expect(buildSignedConsentPdf(input({ consentText: draft }))).rejects.toThrow(
        /consentText: is not in rendered form/,
      );
    });
  },
);
