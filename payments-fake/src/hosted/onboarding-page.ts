// The hosted payout-setup page an account link opens, in our own look and wording and marked as a local
// stand-in; the holder confirms a name and leaves for the platform's return_url.
// Pure: builds HTML strings, no framework imports.

export function escapeHtml(text: string): string {
  return text
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

// A plain page of our own: a stand-in notice across the top, then one left-aligned column of facts and fields.
const STYLE = `
  :root { --paper: #fbfaf7; --ink: #22262b; --muted: #5b6169; --rule: #cfcac0; --notice: #3d3a33;
          --notice-ink: #fbf7ea; --action: #3b5b7a; --action-ink: #ffffff; --danger: #9b2f24; --focus: #b7791f; }
  * { box-sizing: border-box; }
  body { margin: 0; background: var(--paper); color: var(--ink);
         font: 16px/1.55 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; }
  .stand-in { background: var(--notice); color: var(--notice-ink); padding: .6rem 1.25rem; font-size: .9rem; }
  .stand-in strong { font-weight: 700; }
  main { max-width: 38rem; padding: 1.5rem 1.25rem 3rem; margin: 0 auto; }
  h1 { font-size: 1.4rem; margin: .5rem 0 .5rem; font-weight: 650; }
  h2 { font-size: 1rem; margin: 1.75rem 0 .5rem; padding-bottom: .25rem; border-bottom: 1px solid var(--rule); }
  p.lead { color: var(--muted); margin-top: 0; }
  table.facts { border-collapse: collapse; width: 100%; }
  table.facts th { text-align: left; font-weight: 500; color: var(--muted); padding: .3rem 1rem .3rem 0; width: 10rem; vertical-align: top; }
  /* Long addresses wrap instead of widening the page past a phone screen. */
  table.facts { table-layout: fixed; }
  table.facts td { padding: .3rem 0; overflow-wrap: anywhere; }
  label { display: block; font-weight: 600; margin: 1rem 0 .35rem; }
  input[type=text] { width: 100%; max-width: 24rem; padding: .55rem .65rem; border: 1px solid #8f8a80; border-radius: 4px; font: inherit; background: #fff; }
  input[aria-invalid=true] { border-color: var(--danger); border-width: 2px; }
  .check { display: flex; gap: .6rem; align-items: flex-start; font-weight: 400; }
  .check input { margin-top: .35rem; width: 1.05rem; height: 1.05rem; }
  .hint { color: var(--muted); font-size: .875rem; margin: .35rem 0 0; }
  .field-error { color: var(--danger); font-size: .875rem; margin: .35rem 0 0; font-weight: 600; }
  .summary { border-left: 4px solid var(--danger); background: #fbeeec; padding: .6rem 1rem; margin: 1rem 0; }
  .summary ul { margin: .25rem 0 0; padding-left: 1.25rem; }
  .actions { display: flex; gap: 1rem; margin-top: 1.75rem; flex-wrap: wrap; align-items: center; }
  button { font: inherit; cursor: pointer; }
  button.save { background: var(--action); color: var(--action-ink); border: 0; border-radius: 4px; padding: .6rem 1.2rem; font-weight: 600; }
  button.back { background: none; border: 0; color: var(--action); text-decoration: underline; padding: .6rem .25rem; }
  :focus-visible { outline: 3px solid var(--focus); outline-offset: 2px; }
`;

const STAND_IN_NOTICE = `<div class="stand-in" role="note"><strong>Local stand-in for the payment provider.</strong> This page runs on this computer for development and demonstrations; nothing entered here reaches a bank.</div>`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} (local stand-in)</title>
<style>${STYLE}</style>
</head>
<body>
${STAND_IN_NOTICE}
<main>
${body}
</main>
</body>
</html>`;
}

export interface OnboardingForm {
  fullName: string;
  confirmed: boolean;
}

export interface OnboardingPageInput {
  actionPath: string;
  platformName: string;
  email: string | null;
  country: string;
  currency: string;
  form: OnboardingForm;
  errors: { fullName?: string; confirmed?: string };
}

export function renderOnboardingPage(input: OnboardingPageInput): string {
  const { errors } = input;
  const errorList = [errors.fullName, errors.confirmed].filter((message): message is string => Boolean(message));
  const summary =
    errorList.length > 0
      ? `<div class="summary" role="alert"><p><strong>Before saving, please look at:</strong></p><ul>${errorList
          .map((message) => `<li>${escapeHtml(message)}</li>`)
          .join('')}</ul></div>`
      : '';
  const nameInvalid = errors.fullName ? ' aria-invalid="true"' : '';
  const confirmInvalid = errors.confirmed ? ' aria-invalid="true"' : '';
  const body = `
<h1>Where your payments go</h1>
<p class="lead">${escapeHtml(input.platformName)} sends payments for taking part through its payment provider. A live provider would ask for your bank details on this page; the stand-in only asks for your name.</p>
${summary}
<form method="post" action="${escapeHtml(input.actionPath)}" novalidate>
  <h2>What the provider has on file</h2>
  <table class="facts">
    ${input.email ? `<tr><th scope="row">E-mail address</th><td>${escapeHtml(input.email)}</td></tr>` : ''}
    <tr><th scope="row">Country</th><td>${escapeHtml(input.country)}</td></tr>
    <tr><th scope="row">Currency</th><td>${escapeHtml(input.currency.toUpperCase())}</td></tr>
    <tr><th scope="row">Bank account</th><td>Stand-in account (no real bank)</td></tr>
  </table>
  <h2>Your part</h2>
  <label for="full_name">Name on your bank account</label>
  <input type="text" id="full_name" name="full_name" autocomplete="name" maxlength="100"
         value="${escapeHtml(input.form.fullName)}"${nameInvalid}
         aria-describedby="full_name_hint${errors.fullName ? ' full_name_error' : ''}">
  <p class="hint" id="full_name_hint">Write it the way your bank writes it.</p>
  ${errors.fullName ? `<p class="field-error" id="full_name_error">${escapeHtml(errors.fullName)}</p>` : ''}
  <label class="check" for="confirmed">
    <input type="checkbox" id="confirmed" name="confirmed" value="yes"${input.form.confirmed ? ' checked' : ''}${confirmInvalid}
           ${errors.confirmed ? 'aria-describedby="confirmed_error"' : ''}>
    <span>These details are right, and payments for taking part may be sent to this account.</span>
  </label>
  ${errors.confirmed ? `<p class="field-error" id="confirmed_error">${escapeHtml(errors.confirmed)}</p>` : ''}
  <div class="actions">
    <button type="submit" class="save" name="action" value="complete">Save and go back</button>
    <button type="submit" class="back" name="action" value="leave">Go back without saving</button>
  </div>
</form>`;
  return layout('Where your payments go', body);
}

export function renderMessagePage(title: string, message: string): string {
  return layout(title, `<h1>${escapeHtml(title)}</h1>\n<p class="lead">${escapeHtml(message)}</p>`);
}

/** Checks the submitted form; returns the problems by field (empty when it can be accepted). */
export function checkOnboardingForm(form: OnboardingForm): OnboardingPageInput['errors'] {
  const errors: OnboardingPageInput['errors'] = {};
  const name = form.fullName.trim();
  if (name.length === 0) errors.fullName = 'Name on your bank account: write your name.';
  else if (name.length > 100) errors.fullName = 'Name on your bank account: use at most 100 characters.';
  if (!form.confirmed) errors.confirmed = 'Confirmation: tick the box to say these details are right.';
  return errors;
}
