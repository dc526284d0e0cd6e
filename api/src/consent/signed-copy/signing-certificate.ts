/**
 * The lab's document-signing identity as a PKCS#12 file (certificate + private key). Production points
 * DOCUMENT_SIGNING_P12 at the lab's own; elsewhere a self-signed development certificate is made with node-forge on
 * first start, so signed copies are sealed from day one.
 */
import { generateKeyPairSync, randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import forge from 'node-forge';

export interface SigningIdentity {
  p12: Buffer;
  passphrase: string;
}

/** A self-signed RSA-2048 certificate for document signing, valid for ten years from `now`, as a PKCS#12 file. */
export function createDevelopmentP12(
  passphrase: string,
  commonName = 'Evenhand development document signing',
  now = new Date(),
): Buffer {
  // Node makes the key (fast, native); node-forge builds the certificate and the PKCS#12 container.
  const { privateKey, publicKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });
  const key = forge.pki.privateKeyFromPem(privateKey.export({ type: 'pkcs1', format: 'pem' }).toString());
  const certificate = forge.pki.createCertificate();
  certificate.publicKey = forge.pki.publicKeyFromPem(publicKey.export({ type: 'spki', format: 'pem' }).toString());
  certificate.serialNumber = `01${randomBytes(8).toString('hex')}`;
  certificate.validity.notBefore = new Date(now.getTime() - 24 * 3600 * 1000);
  certificate.validity.notAfter = new Date(now.getTime() + 10 * 365 * 24 * 3600 * 1000);
  const subject = [
    { name: 'commonName', value: commonName },
    { name: 'organizationName', value: 'Evenhand (development)' },
  ];
  certificate.setSubject(subject);
  certificate.setIssuer(subject);
  certificate.setExtensions([
    { name: 'basicConstraints', cA: false },
    { name: 'keyUsage', digitalSignature: true, nonRepudiation: true },
  ]);
  certificate.sign(key, forge.md.sha256.create());
  const asn1 = forge.pkcs12.toPkcs12Asn1(key, [certificate], passphrase, {
    algorithm: '3des',
    friendlyName: commonName,
  });
  return Buffer.from(forge.asn1.toDer(asn1).getBytes(), 'binary');
}

/** Reads the PKCS#12 file; creates a development one when allowed and none exists. */
export function loadSigningIdentity(options: {
  path: string;
  passphrase: string;
  mayCreate: boolean;
}): SigningIdentity {
  try {
    return { p12: readFileSync(options.path), passphrase: options.passphrase };
  } catch (error: unknown) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
    if (!options.mayCreate) throw new Error(`DOCUMENT_SIGNING_P12: ${options.path} does not exist`);
  }
  mkdirSync(dirname(options.path), { recursive: true, mode: 0o700 });
  try {
    // "wx": when two processes start at once, both use the file written first.
    writeFileSync(options.path, createDevelopmentP12(options.passphrase), { flag: 'wx', mode: 0o600 });
  } catch (raced: unknown) {
    if ((raced as NodeJS.ErrnoException).code !== 'EEXIST') throw raced;
  }
  return { p12: readFileSync(options.path), passphrase: options.passphrase };
}
