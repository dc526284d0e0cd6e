import { Link } from 'react-router-dom';
import { Spinner } from '@/components/ui/spinner';
import { formatDate } from '@/lib/date-format';
import { formatMinor } from '@/lib/money';
import { type MyPayout, useMyPayouts } from '../api/get-my-payouts';
import { type AmountsByCurrency, amountsInOrder, payoutTotals } from '../utils/payout-totals';
import { payoutStatusWords } from './payout-status-words';
import { LoadFailed } from '@/components/ui/load-failed';

/** "$22.00", or "€15.00 + $13.00" for pay in more than one currency; `zeroIn` names the currency for nothing at all. */
function amountsText(amounts: AmountsByCurrency, zeroIn: string): string {
  const lines = amountsInOrder(amounts);
  if (lines.length === 0) return formatMinor(0, zeroIn);
  return lines.map((line) => formatMinor(line.minor, line.currency)).join(' + ');
}

/** What is owed, on its way and paid, every payment with its receipt, and the year's total with the tax note. */
export function YourPayments() {
  const payouts = useMyPayouts();

  if (payouts.isPending) return <Spinner label="Loading your payments…" />;
  if (payouts.isError) {
    return <LoadFailed title="We could not load your payments" read={payouts} />;
  }

  const { items, paidThisYearMinor, taxNote } = payouts.data;
  const totals = payoutTotals(items);
  const mainCurrency = items[0]?.currency ?? Object.keys(paidThisYearMinor)[0] ?? null;
  // The api counts the calendar year in UTC.
  const year = new Date().getUTCFullYear();

  return (
    <>
      <section aria-labelledby="your-pay-heading" className="flex flex-col gap-4">
        <h2 id="your-pay-heading" className="text-heading font-bold">
          Your pay
        </h2>
        {items.length === 0 || mainCurrency === null ? (
          <div className="flex flex-col gap-2 rounded-soft bg-sand px-4 py-3">
            <p className="font-semibold">No payments yet</p>
            <p className="text-fine">
              When you finish a step of a study, what it pays shows up here, and you can follow it until it is paid.
            </p>
            <p className="text-fine">
              <Link to="/studies" className="font-semibold text-clay-ink underline decoration-2 underline-offset-4">
                Go to your studies
              </Link>
            </p>
          </div>
        ) : (
          <>
            <dl className="grid grid-cols-3 gap-2 rounded-soft bg-sand p-3 text-center">
              <div className="flex flex-col">
                <dt className="text-fine text-ink-soft">Owed to you</dt>
                <dd className="font-bold">{amountsText(totals.owed, mainCurrency)}</dd>
              </div>
              <div className="flex flex-col">
                <dt className="text-fine text-ink-soft">On its way</dt>
                <dd className="font-bold">{amountsText(totals.onItsWay, mainCurrency)}</dd>
              </div>
              <div className="flex flex-col">
                <dt className="text-fine text-ink-soft">Paid to you</dt>
                <dd className="font-bold">{amountsText(totals.paid, mainCurrency)}</dd>
              </div>
            </dl>
            <p className="text-fine text-ink-soft">
              Owed: you finished the step, and the research team will approve the pay. On its way: approved and being
              sent to your bank account.
            </p>
            <PaymentList items={items} />
          </>
        )}
      </section>

      <section aria-labelledby="this-year-heading" className="flex flex-col gap-3">
        <h2 id="this-year-heading" className="text-heading font-bold">
          This year
        </h2>
        <dl className="flex flex-col gap-1 rounded-soft bg-sand px-4 py-3">
          <div className="flex flex-wrap justify-between gap-x-3">
            <dt>Paid to you in {year}</dt>
            <dd className="font-bold">
              {mainCurrency === null ? 'Nothing yet' : amountsText(paidThisYearMinor, mainCurrency)}
            </dd>
          </div>
        </dl>
        <p>{taxNote}</p>
        <p className="rounded-soft border-l-4 border-sand-deep px-4 py-2 text-fine">
          Rules on pay and tax differ between institutions and countries. The research team’s finance office decides how
          your payments are made and reported; if you have a question about them, ask the research team.
        </p>
      </section>
    </>
  );
}

function PaymentList({ items }: { items: MyPayout[] }) {
  return (
    <div className="flex flex-col gap-3">
      <h3 id="payments-heading" className="text-lead font-bold">
        Payments
      </h3>
      <ul aria-labelledby="payments-heading" className="flex flex-col gap-3">
        {items.map((item) => {
          const status = payoutStatusWords[item.status];
          return (
            <li key={item.id} className="flex flex-col gap-2 rounded-soft border border-sand-deep bg-paper-raised p-4">
              <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
                <p className="font-bold">
                  {item.kind === 'bonus' ? 'Completion bonus' : (item.stepTitle ?? 'A study step')}
                </p>
                <p className="font-bold">{formatMinor(item.amountMinor, item.currency)}</p>
              </div>
              <p className="text-fine text-ink-soft">{item.studyTitle}</p>
              <p className="flex flex-wrap items-center gap-2 text-fine">
                <span className={`rounded-full px-3 py-0.5 font-semibold ${status.classes}`}>{status.label}</span>
                <span className="text-ink-soft">
                  {item.status === 'paid' && item.paidAt
                    ? `Paid on ${formatDate(item.paidAt)}`
                    : `Earned on ${formatDate(item.createdAt)}`}
                </span>
              </p>
              <p className="text-fine">{status.meaning}</p>
              {item.receipt ? (
                <p className="text-fine">
                  Receipt number <span className="font-mono font-semibold wrap-anywhere">{item.receipt}</span>
                </p>
              ) : null}
            </li>
          );
        })}
      </ul>
      <p className="text-fine text-ink-soft">We e-mail you a receipt for every payment once it is paid.</p>
    </div>
  );
}
