/** What a payout receipt says; the amount comes formatted in the payout's currency. */
export interface PayoutReceiptFacts {
  amount: string;
  studyTitle: string;
  receiptNumber: string | null;
  sentOn: string | undefined;
  labName: string;
}

/** The plain-text receipt e-mailed to a participant once their payout is paid. */
export function payoutReceiptMail(facts: PayoutReceiptFacts): { subject: string; text: string } {
  return {
    subject: `Receipt: ${facts.amount} for "${facts.studyTitle}"`,
    text: [
      'Hello,',
      '',
      `We have sent you ${facts.amount} for taking part in "${facts.studyTitle}".`,
      `Receipt number: ${facts.receiptNumber}`,
      `Sent on: ${facts.sentOn}`,
      '',
      'It can take a few working days to reach your bank account. You can see all your payments in the study portal.',
      'Payments for research can count as income. Rules differ by country; if you are unsure, ask a tax adviser.',
      '',
      facts.labName,
    ].join('\n'),
  };
}
