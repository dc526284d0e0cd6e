import type { OutgoingMail } from '../mail/mail.service';

/** The password-reset e-mail for staff: what the link does, how long it works, and what to do if it was not you. */
export function passwordResetMail(to: string, link: string, minutesValid: number): OutgoingMail {
  const text = [
    'Hello,',
    '',
    'Someone (hopefully you) asked to choose a new password for your Evenhand staff account.',
    'Open this link to choose one:',
    '',
    link,
    '',
    `The link works once and expires in ${minutesValid} minutes. Choosing a new password signs you out everywhere else.`,
    'If you did not ask for it, you can ignore this message: your password stays as it is.',
    '',
    'Evenhand',
  ].join('\n');
  const html = `<p>Hello,</p>
<p>Someone (hopefully you) asked to choose a new password for your Evenhand staff account.</p>
<p><a href="${escapeHtml(link)}">Choose a new password</a></p>
<p>The link works once and expires in ${minutesValid} minutes. Choosing a new password signs you out everywhere else.
If you did not ask for it, you can ignore this message: your password stays as it is.</p>
<p>Evenhand</p>`;
  return { to, subject: 'Choose a new Evenhand password', text, html };
}

function escapeHtml(value: string): string {
  return value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );
}
