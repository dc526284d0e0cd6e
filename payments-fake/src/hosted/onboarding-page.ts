// The hosted payout-setup page an account link opens. Our own look and wording; the holder
// confirms a name and the terms, and leaves for the platform's return_url.
// Pure: builds HTML strings, no framework imports.

export function escapeHtml(text: string): string {
  return text
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

const STYLE = `
  :root { --paper: #f7f4ee; --ink: #1d2733; --muted: #5a6472; --accent: #2c6e63; --accent-ink: #ffffff;
          --line: #d9d3c7; --danger: #a3352b; --focus: #c98a1b; }
  * { box-sizing: border-box; }
  body { margin: 0; background: var(--paper); color: var(--ink);
         font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; }
  main { max-width: 32rem; margin: 3rem auto; padding: 2rem; background: #fff;
         border: 1px solid var(--line); border-radius: 12px; }
  h1 { font-size: 1.5rem; margin: 0 0 .25rem; }
  .badge { display: inline-block; font-size: .75rem; letter-spacing: .04em; text-transform: uppercase;
           background: #efe6d2; color: #6b4e12; border-radius: 999px; padding: .1rem .6rem; margin-bottom: 1rem; }
  p.lead { color: var(--muted); margin-top: 0; }
  label { display: block; font-weight: 600; margin: 1.25rem 0 .35rem; }
  input[type=text] { width: 100%; padding: .6rem .7rem; border: 1px solid var(--line); border-radius: 8px; font: inherit; }
  input[aria-invalid=true] { border-color: var(--danger); }
  .check { display: flex; gap: .6rem; align-items: flex-start; margin-top: 1.25rem; font-weight: 400; }
  .check input { margin-top: .3rem; }
  .hint { color: var(--muted); font-size: .875rem; margin: .35rem 0 0; }
  .field-error { color: var(--danger); font-size: .875rem; margin: .35rem 0 0; }
  .summary { border: 1px solid var(--danger); color: var(--danger); border-radius: 8px; padding: .75rem 1rem; margin: 1rem 0; }
  dl { display: grid; grid-template-columns: auto 1fr; gap: .25rem 1rem; margin: 1.25rem 0 0; }
  dt { color: var(--muted); }
  dd { margin: 0; }
  .actions { display: flex; gap: .75rem; margin-top: 1.75rem; flex-wrap: wrap; }
  button { font: inherit; border-radius: 8px; padding: .6rem 1.1rem; cursor: pointer; border: 1px solid var(--accent); }
  button.primary { background: var(--accent); color: var(--accent-ink); }
  button.secondary { background: #fff; color: var(--accent); }
  :focus-visible { outline: 3px solid var(--focus); outline-offset: 2px; }
`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
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
      ? `<div class="summary" role="alert"><p><strong>Please check the form:</strong></p><ul>${errorList
          .map((message) => `<li>${escapeHtml(message)}</li>`)
          .join('')}</ul></div>`
      : '';
  const nameInvalid = errors.fullName ? ' aria-invalid="true"' : '';
  const confirmInvalid = errors.confirmed ? ' aria-invalid="true"' : '';
  const body = `
<span class="badge">Test mode</span>
<h1>Set up payouts</h1>
<p class="lead">${escapeHtml(input.platformName)} would like to send you payments. Confirm your details to receive them.</p>
${summary}
<form method="post" action="${escapeHtml(input.actionPath)}" novalidate>
  <dl>
    ${input.email ? `<dt>Email</dt><dd>${escapeHtml(input.email)}</dd>` : ''}
    <dt>Country</dt><dd>${escapeHtml(input.country)}</dd>
    <dt>Paid out in</dt><dd>${escapeHtml(input.currency.toUpperCase())}</dd>
    <dt>Bank account</dt><dd>Test bank account ending in 6789</dd>
  </dl>
  <label for="full_name">Full legal name</label>
  <input type="text" id="full_name" name="full_name" autocomplete="name" maxlength="100"
         value="${escapeHtml(input.form.fullName)}"${nameInvalid}
         aria-describedby="full_name_hint${errors.fullName ? ' full_name_error' : ''}">
  <p class="hint" id="full_name_hint">As it appears on your bank account.</p>
  ${errors.fullName ? `<p class="field-error" id="full_name_error">${escapeHtml(errors.fullName)}</p>` : ''}
  <label class="check" for="confirmed">
    <input type="checkbox" id="confirmed" name="confirmed" value="yes"${input.form.confirmed ? ' checked' : ''}${confirmInvalid}
           ${errors.confirmed ? 'aria-describedby="confirmed_error"' : ''}>
    <span>I confirm these details are correct and agree to receive payouts to this bank account.</span>
  </label>
  ${errors.confirmed ? `<p class="field-error" id="confirmed_error">${escapeHtml(errors.confirmed)}</p>` : ''}
  <div class="actions">
    <button type="submit" class="primary" name="action" value="complete">Finish setup</button>
    <button type="submit" class="secondary" name="action" value="leave">Leave for now</button>
  </div>
</form>`;
  return layout('Set up payouts', body);
}

export function renderMessagePage(title: string, message: string): string {
  return layout(title, `<h1>${escapeHtml(title)}</h1>\n<p class="lead">${escapeHtml(message)}</p>`);
}

/** Checks the submitted form; returns the problems by field (empty when it can be accepted). */
export function checkOnboardingForm(form: OnboardingForm): OnboardingPageInput['errors'] {
  const errors: OnboardingPageInput['errors'] = {};
  const name = form.fullName.trim();
  if (name.length === 0) errors.fullName = 'Full legal name: enter your name.';
  else if (name.length > 100) errors.fullName = 'Full legal name: use at most 100 characters.';
  if (!form.confirmed) errors.confirmed = 'Confirmation: tick the box to confirm your details.';
  return errors;
}
