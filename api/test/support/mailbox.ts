/** Reads the local development mailbox (maildev) that `npm test` starts. */
const MAILBOX_URL = process.env.MAILBOX_URL ?? 'http://127.0.0.1:1080';

export interface MailboxMessage {
  id: string;
  subject: string;
  text: string;
  html: string;
  to: Array<{ address: string }>;
  attachments?: Array<{ contentType: string; fileName: string; length: number }>;
}

export async function waitForMail(recipient: string, timeoutMs = 20_000, subject?: RegExp): Promise<MailboxMessage> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const response = await fetch(`${MAILBOX_URL}/api/email`);
    const messages = (await response.json()) as MailboxMessage[];
    const found = messages.filter(
      (m) =>
        m.to.some((to) => to.address.toLowerCase() === recipient.toLowerCase()) &&
        (!subject || subject.test(m.subject)),
    );
    if (found.length > 0) return found[found.length - 1];
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`No e-mail reached ${recipient} within ${timeoutMs} ms`);
}

export function signInTokenFrom(message: MailboxMessage): string {
  const match = /[?&]token=([A-Za-z0-9_-]+)/.exec(message.text);
  if (!match) throw new Error(`No sign-in link in: ${message.text}`);
  return match[1];
}

export function uniqueAddress(prefix: string): string {
  return `${prefix}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}@example.test`;
}
