/** A SHA-256 fingerprint is 64 hex characters; people compare the ends, so the short form keeps both. */
export function shortFingerprint(fingerprint: string, keep = 8): string {
  const hex = fingerprint.trim().toLowerCase();
  if (hex.length <= keep * 2 + 1) return hex;
  return `${hex.slice(0, keep)}…${hex.slice(-keep)}`;
}

/** The whole fingerprint in groups of four, so it can be read aloud or compared by eye without losing one's place. */
export function groupedFingerprint(fingerprint: string, groupSize = 4): string[] {
  const hex = fingerprint.trim().toLowerCase();
  const groups: string[] = [];
  for (let start = 0; start < hex.length; start += groupSize) groups.push(hex.slice(start, start + groupSize));
  return groups;
}
