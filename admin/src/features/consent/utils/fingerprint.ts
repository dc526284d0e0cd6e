/** "e5b32837…5094a", as the study header shortens fingerprints; the version itself shows the whole value. */
export function shortFingerprint(fingerprint: string): string {
  return fingerprint.length <= 14 ? fingerprint : `${fingerprint.slice(0, 8)}…${fingerprint.slice(-5)}`;
}
