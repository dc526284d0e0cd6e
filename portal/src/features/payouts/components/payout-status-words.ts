import type { PayoutStatus } from '../api/get-my-payouts';

/** Each payment status in a participant's words, with what it means for them. */
export const payoutStatusWords: Record<PayoutStatus, { label: string; meaning: string; classes: string }> = {
  owed: {
    label: 'Waiting for approval',
    meaning: 'The research team checks completed steps, then sends the pay.',
    classes: 'bg-clay-tint text-clay-ink',
  },
  approved: { label: 'Approved', meaning: 'Approved and about to be sent.', classes: 'bg-sand text-ink' },
  sending: { label: 'On its way', meaning: 'Being sent to your bank account.', classes: 'bg-sand text-ink' },
  paid: { label: 'Paid', meaning: 'Sent to your bank account.', classes: 'bg-moss-tint text-moss-ink' },
  failed: {
    label: 'Delayed',
    meaning: 'It did not go through the first time. The research team will send it again.',
    classes: 'bg-ember-tint text-ember',
  },
  cancelled: { label: 'Cancelled', meaning: 'This payment will not be sent.', classes: 'bg-sand text-ink-soft' },
  reversed: {
    label: 'Returned',
    meaning: 'It came back from the bank. It is owed to you again and listed once more.',
    classes: 'bg-sand text-ink-soft',
  },
};
