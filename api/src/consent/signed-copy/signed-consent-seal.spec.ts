import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { wayfindingConsentFields } from '../consent-fields.fixture';
import { fillConsentTemplate } from '../consent-template';
import { renderedConsentText, renderedTextFingerprint } from '../consent-text';
import { buildSignedConsentPdf, PdfSealIdentity, SignedConsentPdfInput } from './signed-consent-pdf';
import { createDevelopmentP12, loadSigningIdentity } from './signing-certificate';

const consentText = renderedConsentText(fillConsentTemplate(wayfindingConsentFields));
const input: SignedConsentPdfInput = {
  consentText,
  textFingerprint: renderedTextFingerprint(consentText),
  studyTitle: 'Wayfinding cues',
  labName: 'Harbor Lane Cognition Lab',
  formVersion: 2,
  consentVersionId: '6f1c2b8e-0d3a-4c5e-9b7a-2e4d6f8a0c1b',
  ethicsApprovalReference: 'HLREB-2025-031',
  ethicsApprovedOn: '2025-02-20',
  enrollmentReference: 'ENR-7Q4K-2M9D',
  signer: {
    typedName: 'Sam Example',
    signedAt: new Date('2025-03-14T09:26:53.000Z'),
    timeZone: 'Europe/Berlin',
    meaning: 'I have read this form and agree to take part',
    ipAddress: '203.0.113.24',
    userAgent: 'Mozilla/5.0',
  },
};

// Temporary files stay in the checkout's git-ignored folder.
const dir = mkdtempSync(join(resolve(__dirname, '../../../../.local/tmp'), 'seal-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Outside check: pdfsig from Debian's poppler-utils (exits 0 either way, so its text is what counts). */
function pdfsig(bytes: Uint8Array): string {
  const file = join(dir, `copy-${Math.random().toString(36).slice(2)}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('pdfsig', [file]).toString();
}

describe('sealed signed copy (PDF digital signature, detached PKCS#7/CMS)', { timeout: 60_000 }, () => {
  let identity: PdfSealIdentity;
  beforeAll(() => {
    identity = { p12: createDevelopmentP12('a-test-passphrase'), passphrase: 'a-test-passphrase' };
  });

  it('verifies with pdfsig, and shows a digest mismatch after one byte of the signed content changes', async () => {
    const sealed = await buildSignedConsentPdf(input, identity);
    expect(sealed.sealed).toBe(true);
    const report = pdfsig(sealed.bytes);
    expect(report).toContain('Signature is Valid.');
    expect(report).toContain('Evenhand development document signing');
    const changed = Buffer.from(sealed.bytes);
    const at = changed.indexOf('Harbor Lane Cognition Lab');
    changed[at] = 'J'.charCodeAt(0);
    expect(pdfsig(changed)).toContain('Digest Mismatch.');
  });

  it('gives the same bytes for the same input and identity, and keeps the text fingerprint on the page', async () => {
    const first = await buildSignedConsentPdf(input, identity);
    const second = await buildSignedConsentPdf(input, identity);
    expect(Buffer.from(second.bytes).equals(Buffer.from(first.bytes))).toBe(true);
    expect(Buffer.from(first.bytes).includes(Buffer.from('/adbe.pkcs7.detached'))).toBe(true);
  });

  it('refuses a P12 with the wrong passphrase', async () => {
    await expect(buildSignedConsentPdf(input, { ...identity, passphrase: 'not-the-passphrase' })).rejects.toThrow();
  });

  it('creates a development identity once and reuses it; outside development a missing file stops start-up', () => {
    const path = join(dir, 'keys/signing.p12');
    const created = loadSigningIdentity({ path, passphrase: 'pass-phrase', mayCreate: true });
    expect(loadSigningIdentity({ path, passphrase: 'pass-phrase', mayCreate: true }).p12.equals(created.p12)).toBe(
      true,
    );
    expect(() =>
      loadSigningIdentity({ path: join(dir, 'missing.p12'), passphrase: 'pass-phrase', mayCreate: false }),
    ).toThrow(/DOCUMENT_SIGNING_P12/);
  });
});
