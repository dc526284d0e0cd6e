import type { INestApplicationContext } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type { SessionUser } from '../../common/auth/session-user';
import { PaymentsService } from '../../payments/payments.service';
import { FundingService } from '../../payouts/funding.service';
import { PayoutAccountsService } from '../../payouts/payout-accounts.service';
import { PayoutApprovalService } from '../../payouts/payout-approval.service';
import { PayoutSendingService } from '../../payouts/payout-sending.service';
import type { DemoStudy } from './demo-scenario';
import { completeHostedOnboarding } from './hosted-onboarding';

const DAY_MS = 24 * 3600 * 1000;

/**
 * Gives a demo study its money story through the same services and the same payment provider the api uses:
 * card fundings, payees who set up getting paid on the hosted page, older payouts approved and paid, recent
 * ones still owed, a few people who never set up, and one payout that failed and can be retried.
 * Needs the payment provider (the local stand-in in development) to be reachable.
 */
export async function playDemoPayouts(
  app: INestApplicationContext,
  coordinator: SessionUser,
  studyId: string,
  demo: DemoStudy,
  people: SessionUser[],
): Promise<void> {
  const pay = demo.pay;
  if (!pay) return;
  const dataSource = app.get(DataSource);
  const fundingService = app.get(FundingService);
  const approval = app.get(PayoutApprovalService);
  const sending = app.get(PayoutSendingService);
  const accounts = app.get(PayoutAccountsService);
  const provider = app.get(PaymentsService).client;
  const now = Date.now();

  for (const funding of pay.fundings) {
    const intent = await fundingService.createFunding(coordinator, studyId, funding.amountMinor);
    // The provider's test card whose money is available at once, so the older payouts below can be sent.
    await provider.paymentIntents.confirm(intent.clientSecret.split('_secret_')[0], {
      payment_method: 'pm_card_bypassPending',
    });
    await fundingService.refreshFunding(studyId, intent.fundingId);
    const at = new Date(now - funding.daysAgo * DAY_MS);
    await dataSource.query(`UPDATE study_funding SET created_at = $1, succeeded_at = $1 WHERE id = $2`, [
      at,
      intent.fundingId,
    ]);
  }

  const owed: Array<{ id: string; participant_id: string; created_at: Date }> = await dataSource.query(
    `SELECT id, participant_id, created_at FROM payout WHERE study_id = $1 AND status = 'owed' ORDER BY created_at, id`,
    [studyId],
  );
  const payeeIds = [...new Set(owed.map((p) => p.participant_id))];
  const payees = people.filter((person) => payeeIds.includes(person.id));
  const neverSetUp = new Set(payees.slice(payees.length - (pay.notSetUp ?? 0)).map((p) => p.id));
  const settingUp = payees.filter((person) => !neverSetUp.has(person.id));
  const paidBefore = now - (pay.paidAfterDays ?? 7) * DAY_MS;
  const due = owed.filter((p) => p.created_at.getTime() < paidBefore && !neverSetUp.has(p.participant_id));

  // The coordinator approved one payout before its payee had finished setting up: the send failed.
  const failing = pay.failedOnce ? due.find((p) => p.participant_id === settingUp[0]?.id) : undefined;
  if (failing) {
    await approval.approve(coordinator, studyId, [failing.id]);
    await sending.send(failing.id);
  }

  for (const person of settingUp) {
    const { url } = await accounts.startOnboarding(person);
    await completeHostedOnboarding(url, `Demo Participant ${person.email.split('@')[0]}`);
    const status = await accounts.accountStatus(person);
    if (!status.payoutsEnabled)
      throw new Error(`demo payee ${person.email} finished onboarding but payouts are not enabled`);
  }

  const toPay = due.filter((p) => p.id !== failing?.id);
  if (toPay.length) {
    await approval.approve(
      coordinator,
      studyId,
      toPay.map((p) => p.id),
    );
    for (const payout of toPay) await sending.send(payout.id);
  }
  // Dated as if each was approved two days after it was earned and paid the same day, receipt included.
  await dataSource.query(
    `UPDATE payout SET approved_at = created_at + interval '2 days', sent_at = created_at + interval '2 days',
            paid_at = CASE WHEN status = 'paid' THEN created_at + interval '2 days' END,
            receipt_sent_at = CASE WHEN status = 'paid' THEN created_at + interval '2 days' END
     WHERE id = ANY($1::uuid[])`,
    [[...toPay.map((p) => p.id), ...(failing ? [failing.id] : [])]],
  );
  const [summary] = await dataSource.query(
    `SELECT count(*) FILTER (WHERE status = 'paid')::int AS paid, count(*) FILTER (WHERE status = 'failed')::int AS failed,
            count(*) FILTER (WHERE status = 'owed')::int AS owed
     FROM payout WHERE study_id = $1`,
    [studyId],
  );
  if (summary.paid !== toPay.length || summary.failed !== (failing ? 1 : 0)) {
    throw new Error(`demo payouts of ${demo.slug} did not end as planned: ${JSON.stringify(summary)}`);
  }
}

/**
 * The demo's paid payouts point at transfers the provider holds. The local stand-in keeps them in its state file;
 * when that file is gone but the database is not, say so rather than let reconciliation surprise someone.
 */
export async function warnIfProviderForgotDemoPayouts(app: INestApplicationContext): Promise<string | null> {
  const [paid] = await app
    .get(DataSource)
    .query(
      `SELECT provider_transfer_id FROM payout WHERE status = 'paid' AND provider_transfer_id IS NOT NULL ORDER BY paid_at LIMIT 1`,
    );
  if (!paid) return null;
  try {
    await app.get(PaymentsService).client.transfers.retrieve(paid.provider_transfer_id);
    return null;
  } catch (error) {
    return `The payment provider does not know transfer ${paid.provider_transfer_id} of the demo (${(error as Error).message}). If the stand-in's state file was removed, remove the database folder too (.local/postgres) so the demo is built afresh.`;
  }
}
