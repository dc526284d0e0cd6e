/** True for an absolute http(s) address; anything else (javascript:, data:, a bare path) is never followed. */
export function isWebAddress(address: string): boolean {
  try {
    const { protocol } = new URL(address);
    return protocol === 'https:' || protocol === 'http:';
  } catch {
    return false;
  }
}

/** Leaves the portal for a page on another site (the payment service's setup page). Kept apart so tests can stand in. */
export function leaveForExternalPage(address: string): void {
  window.location.assign(address);
}
