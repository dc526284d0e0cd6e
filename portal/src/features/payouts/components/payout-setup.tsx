import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Spinner } from '@/components/ui/spinner';
import { describeProblem } from '@/lib/problem-message';
import { usePayoutAccount } from '../api/get-payout-account';
import { useStartPayoutSetup } from '../api/start-payout-setup';
import { type SetupReturn, type SetupView, setupView } from '../utils/setup-view';
import { LoadFailed } from '@/components/ui/load-failed';

const pill: Record<Exclude<SetupView, 'checking'>, { words: string; classes: string }> = {
  none: { words: 'Not set up yet', classes: 'bg-clay-tint text-clay-ink' },
  started: { words: 'Not finished', classes: 'bg-clay-tint text-clay-ink' },
  expired: { words: 'Not finished', classes: 'bg-clay-tint text-clay-ink' },
  'being-checked': { words: 'Being checked', classes: 'bg-sand text-ink' },
  ready: { words: 'Set up', classes: 'bg-moss-tint text-moss-ink' },
};

/** The participant's payout setup with the payment service: where it stands and the way to start or finish it. */
export function PayoutSetup({ returnedFrom }: { returnedFrom: SetupReturn }) {
  const account = usePayoutAccount({ waitForPayouts: returnedFrom === 'done' });
  const start = useStartPayoutSetup();

  if (account.isPending) return <Spinner label="Checking how you get paid…" />;
  if (account.isError) {
    return <LoadFailed title="We could not check how you get paid" read={account} />;
  }

  const view = setupView(account.data, returnedFrom, account.checksLeft);
  // After success the browser is already on its way to the payment service's page.
  const leaving = start.isPending || start.isSuccess;
  const setUpButton = (label: string, variant: 'primary' | 'secondary' = 'primary') => (
    <Button wide variant={variant} onClick={() => start.mutate()} disabled={leaving}>
      {leaving ? 'Opening the payment service…' : label}
    </Button>
  );

  if (view === 'checking') {
    return (
      <section aria-labelledby="payout-setup-heading" className={panelClasses}>
        <h2 id="payout-setup-heading" className="text-heading font-bold">
          How you get paid
        </h2>
        <Spinner label="Welcome back. Checking your setup with the payment service…" />
      </section>
    );
  }

  return (
    <section aria-labelledby="payout-setup-heading" className={panelClasses}>
      {returnedFrom === 'done' && view === 'ready' ? (
        <Notice tone="success" title="You’re set up">
          Thank you. Your pay will go to the bank account you gave the payment service.
        </Notice>
      ) : null}
      {view === 'expired' ? (
        <Notice title="That setup link has expired">
          For your safety, each setup link works once and only for a short while. Get a new link to carry on where you
          stopped.
        </Notice>
      ) : null}

      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="payout-setup-heading" className="text-heading font-bold">
          How you get paid
        </h2>
        <p className={`rounded-full px-3 py-0.5 text-fine font-semibold ${pill[view].classes}`}>{pill[view].words}</p>
      </div>

      {view === 'none' ? (
        <>
          <p>
            To receive your pay, tell our payment service which bank account to send it to. It takes about two minutes.
          </p>
          <p className="text-fine text-ink-soft">
            You will go to the payment service’s secure page, then come straight back here. Evenhand never sees your
            bank details.
          </p>
          {setUpButton('Set up how you get paid')}
        </>
      ) : null}
      {view === 'started' ? (
        <>
          <p>
            You started setting up but have not finished. Pick up where you left off; it only takes a minute or two.
          </p>
          {setUpButton('Continue setting up')}
        </>
      ) : null}
      {view === 'expired' ? setUpButton('Get a new setup link') : null}
      {view === 'being-checked' ? (
        <>
          <p>
            The payment service is checking your details. This usually takes a few minutes, and you do not need to do
            anything. Your pay is kept for you in the meantime.
          </p>
          {setUpButton('Open the payment service’s page', 'secondary')}
        </>
      ) : null}
      {view === 'ready' ? <p>Your pay goes to the bank account you gave the payment service.</p> : null}

      {start.isError ? (
        <Notice tone="error" title="We could not open the payment service">
          {describeProblem(start.error)}
        </Notice>
      ) : null}
    </section>
  );
}

const panelClasses = 'flex flex-col gap-4 rounded-card border border-sand-deep bg-paper-raised p-5 shadow-card';
