import { e2eEnv } from './env';

/** The part of a maildev message the journeys read. */
export type MailboxMessage = {
  id: string;
  subject: string;
  to: { address: string }[];
  text: string;
  html: string;
  time?: string;
  date?: string;
};

async function listMessages(): Promise<MailboxMessage[]> {
  const response = await fetch(`${e2eEnv.mailboxUrl}/api/email`, { headers: { Accept: 'application/json' } });
  if (!response.ok) throw new Error(`Mailbox at ${e2eEnv.mailboxUrl} answered ${response.status}`);
  return (await response.json()) as MailboxMessage[];
}

/**
 * Polls the local mailbox until a message to `recipient` arrives (other tests may be sending mail at the same time,
 * so match on the address, never "the latest message"); `subject` narrows it to one kind of message.
 */
export async function waitForMessageTo(
  recipient: string,
  { timeoutMs = 30_000, intervalMs = 250, subject }: { timeoutMs?: number; intervalMs?: number; subject?: RegExp } = {},
): Promise<MailboxMessage> {
  const wanted = recipient.toLowerCase();
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const matching = (await listMessages()).filter(
      (message) =>
        message.to.some((to) => to.address.toLowerCase() === wanted) &&
        (subject === undefined || subject.test(message.subject)),
    );
    const newest = matching.at(-1);
    if (newest) return newest;
    if (Date.now() > deadline) {
      throw new Error(
        `No e-mail to ${recipient}${subject ? ` with a subject like ${subject}` : ''} arrived within ${timeoutMs} ms`,
      );
    }
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
}

/** Every message the mailbox holds for `recipient`, oldest first. */
export async function messagesTo(recipient: string): Promise<MailboxMessage[]> {
  const wanted = recipient.toLowerCase();
  return (await listMessages()).filter((message) => message.to.some((to) => to.address.toLowerCase() === wanted));
}

/** The portal sign-in link in a message's plain-text part. */
export function signInLinkIn(message: MailboxMessage): URL {
  const found = message.text.match(/https?:\/\/\S+\/sign-in\/link\?token=[\w.~%-]+/);
  if (!found) throw new Error(`No sign-in link in the e-mail "${message.subject}":\n${message.text}`);
  return new URL(found[0]);
}
