import { useSearchParams } from 'react-router-dom';
import { PayoutSetup } from '@/features/payouts/components/payout-setup';
import { YourPayments } from '@/features/payouts/components/your-payments';
import { setupReturnFrom } from '@/features/payouts/utils/setup-view';

/** `/payouts`: "Getting paid". The payment service sends people back here with `?onboarding=done` or `=expired`. */
export function PayoutsRoute() {
  const [searchParams] = useSearchParams();
  const returnedFrom = setupReturnFrom(searchParams);

  return (
    <div className="flex flex-col gap-8">
      <title>Getting paid · Evenhand</title>
      <div className="flex flex-col gap-2">
        <h1 className="text-title font-bold">Getting paid</h1>
        <p className="text-body text-ink-soft">
          Set up how you receive your pay, and follow each payment from the step you finished to your bank account.
        </p>
      </div>
      <PayoutSetup returnedFrom={returnedFrom} />
      <YourPayments />
    </div>
  );
}
