import type { OutgoingMail } from '../mail/mail.service';

/** The sign-in e-mail: plain, short, and honest about what the link does. */
export function signInLinkMail(to: string, link: string, minutesValid: number, studyTitle?: string): OutgoingMail {
  const purpose = studyTitle ? ` to continue with the study "${studyTitle}"` : '';
  const text = [
    'Hello,',
    '',
    `Someone (hopefully you) asked to sign in to Evenhand${purpose}.`,
    'Open this link to sign in:',
    '',
    link,
    '',
    `The link works once and expires in ${minutesValid} minutes.`,
    'If you did not ask for it, you can ignore this message: nothing happens until the link is opened.',
    '',
    'Evenhand, on behalf of the research team',
  ].join('\n');
  const html = `<p>Hello,</p>
<p>Someone (hopefully you) asked to sign in to Evenhand${escapeHtml(purpose)}.</p>
<p><a href="${escapeHtml(link)}">Sign in to Evenhand</a></p>
<p>The link works once and expires in ${minutesValid} minutes. If you did not ask for it, you can ignore this message: nothing happens until the link is opened.</p>
<p>Evenhand, on behalf of the research team</p>`;
  return { to, subject: 'Your Evenhand sign-in link', text, html };
}

function escapeHtml(value: string): string {
  return value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );
}
