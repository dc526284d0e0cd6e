import { it } from 'vitest';
import { writeFileSync, mkdirSync } from 'node:fs';
import { PNG } from 'pngjs';
import { wayfindingConsentFields } from '../consent/consent-fields.fixture';
import { fillConsentTemplate } from '../consent/consent-template';
import { renderedConsentText, renderedTextFingerprint } from '../consent/consent-text';
import { buildSignedConsentPdf } from './signed-consent-pdf';
it("scratch", { timeout: 60000 }, async () => {
  const png = new PNG({ width: 300, height: 100 });
  for (let x = 10; x < 290; x += 1) { const y = Math.round(50 + 30 * Math.sin(x / 22) * Math.cos(x / 57)); for (let dy = -2; dy <= 2; dy += 1) png.data.set([20, 30, 90, 255], ((y + dy) * 300 + x) * 4); }
  const text = renderedConsentText(fillConsentTemplate({ ...wayfindingConsentFields, investigatorName: 'Dr. Zoë Ångström-Núñez', studyPurpose: 'We test whether “sound” cues – or map cues — help people ≥ 18 find their way; it’s ≤ 1 hour, paid in €, £ or $.' }));
  const t0 = Date.now();
  const pdfInput = { consentText: text, textFingerprint: renderedTextFingerprint(text), studyTitle: 'Wayfinding cues', labName: 'Harbor Lane Cognition Lab', formVersion: 2, consentVersionId: '6f1c2b8e-0d3a-4c5e-9b7a-2e4d6f8a0c1b', ethicsApprovalReference: 'HLREB-2025-031', ethicsApprovedOn: '2025-02-20', enrollmentReference: 'ENR-7Q4K-2M9D', signatureId: 'b3e1f0a2-7c4d-4e6f-8a9b-0c1d2e3f4a5b',
    signer: { typedName: 'Maëlle Ó Súilleabháin-Øvergård', signedAt: new Date('2025-03-14T09:26:53.000Z'), timeZone: 'Europe/Berlin', meaning: 'I have read this form and agree to take part', markPngDataUrl: `data:image/png;base64,${PNG.sync.write(png).toString('base64')}`, ipAddress: '203.0.113.24', userAgent: 'Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Safari/537.36' } };
  const pdf = await buildSignedConsentPdf(pdfInput);
  for (let i = 0; i < 3; i++) { const t = Date.now(); await buildSignedConsentPdf(pdfInput); console.log('again ms', Date.now() - t); }
  console.log('build ms', Date.now() - t0, 'pages', pdf.pageCount, 'bytes', pdf.bytes.length);
  mkdirSync('/work/main/.local/screenshots/pdf', { recursive: true });
  writeFileSync('/work/main/.local/screenshots/pdf/signed-consent.pdf', pdf.bytes);
});
