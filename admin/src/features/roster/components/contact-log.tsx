import { useState } from 'react';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useContacts, type Contact } from '../api/get-contacts';
import type { RosterEntry } from '../api/get-roster';
import { mayMarkLost } from '../utils/roster-actions';
import { SendMessageDialog } from './send-message-dialog';
import { formatMoment } from '@/lib/dates';

const kindWording: Record<Contact['kind'], { label: string; tone: BadgeTone }> = {
  invitation: { label: 'Invitation', tone: 'neutral' },
  reminder: { label: 'Reminder', tone: 'spruce' },
  'reconsent-request': { label: 'Re-consent request', tone: 'caution' },
  'staff-message': { label: 'Staff message', tone: 'success' },
};

export interface ContactLogProps {
  studyId: string;
  enrollment: RosterEntry;
  /** Coordinators and admins send messages and mark people lost. */
  canManage: boolean;
  /** Opens the existing “lost to follow-up” confirmation for this person. */
  onMarkLost: () => void;
}

/** Every e-mail sent to this participant, newest first, and Evenhand's suggestion when reminders go unanswered. */
export function ContactLog({ studyId, enrollment, canManage, onMarkLost }: ContactLogProps) {
  const contacts = useContacts(studyId, enrollment.id);
  const [composing, setComposing] = useState(false);
  const [composeKey, setComposeKey] = useState(0);
  const [announcement, setAnnouncement] = useState<string | null>(null);

  return (
    <Panel
      id="contacts"
      title="Contact log"
      description="Invitations, reminders, re-consent requests and staff messages sent to this person."
      actions={
        canManage && (
          <Button
            onClick={() => {
              setAnnouncement(null);
              setComposeKey((key) => key + 1);
              setComposing(true);
            }}
          >
            Send a message…
          </Button>
        )
      }
    >
      <div aria-live="polite" className="empty:hidden">
        {announcement && (
          <Notice tone="info" className="mb-3">
            {announcement}
          </Notice>
        )}
      </div>
      {contacts.isPending ? (
        <LoadingState label="Loading the contact log…" />
      ) : contacts.isError ? (
        <ErrorState
          message={contacts.error instanceof ApiError ? contacts.error.message : 'The contact log could not be loaded.'}
          onRetry={() => void contacts.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-3">
          {contacts.data.suggestLost && (
            <Notice tone="caution">
              <p>
                <span className="font-semibold">
                  {contacts.data.unansweredReminders} reminders have gone unanswered
                </span>{' '}
                (the plan suggests marking someone lost to follow-up after {contacts.data.suggestLostAfter}). Evenhand
                only suggests this; decide after trying to reach them another way.
              </p>
              {canManage && mayMarkLost(enrollment.status) && (
                <Button size="compact" className="mt-2" onClick={onMarkLost}>
                  Mark lost to follow-up…
                </Button>
              )}
            </Notice>
          )}
          <p className="text-sm text-ink-muted">
            Unanswered reminders since the last step was done:{' '}
            <span className="font-semibold text-ink tabular-nums">{contacts.data.unansweredReminders}</span>
          </p>
          {contacts.data.items.length === 0 ? (
            <p className="text-sm text-ink-muted">Nothing has been sent to this person yet.</p>
          ) : (
            <ol
              className="flex flex-col divide-y divide-line rounded-md border border-line"
              aria-label="Contacts, newest first"
            >
              {[...contacts.data.items]
                .sort((a, b) => Date.parse(b.sentAt) - Date.parse(a.sentAt))
                .map((contact) => (
                  <li key={contact.id} className="flex flex-col gap-0.5 px-3 py-2 text-sm">
                    <span className="flex flex-wrap items-center gap-2">
                      <Badge tone={kindWording[contact.kind].tone}>{kindWording[contact.kind].label}</Badge>
                      <span className="font-medium">{contact.subject}</span>
                    </span>
                    <span className="text-xs text-ink-muted">
                      <time dateTime={contact.sentAt}>{formatMoment(contact.sentAt)}</time>
                      {contact.stepTitle && ` · about ${contact.stepTitle}`}
                      {contact.sentByEmail && ` · sent by ${contact.sentByEmail}`}
                    </span>
                  </li>
                ))}
            </ol>
          )}
        </div>
      )}
      {canManage && (
        <SendMessageDialog
          key={composeKey}
          studyId={studyId}
          enrollmentId={enrollment.id}
          reference={enrollment.reference}
          email={enrollment.email}
          open={composing}
          onClose={() => setComposing(false)}
          onSent={() => {
            setComposing(false);
            setAnnouncement(`The message was sent to ${enrollment.email} and logged.`);
          }}
        />
      )}
    </Panel>
  );
}
