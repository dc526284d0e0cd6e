/**
 * Fills in and submits the payment provider's hosted onboarding form, as a participant does in the browser after
 * "Get paid". Used by the demo loader and the payout benchmark, which have no browser; in development and tests the
 * page is the local stand-in's.
 */
export async function completeHostedOnboarding(url: string, fullName: string): Promise<void> {
  const page = await fetch(url);
  if (!page.ok) throw new Error(`the onboarding page at ${url} answered ${page.status}`);
  const action = /<form[^>]*action="([^"]+)"/.exec(await page.text())?.[1];
  if (!action) throw new Error(`the onboarding page at ${url} has no form`);
  const done = await fetch(new URL(action, url), {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ full_name: fullName, confirmed: 'yes', action: 'complete' }).toString(),
  });
  if (done.status !== 303) throw new Error(`onboarding answered ${done.status} instead of sending the person back`);
}
