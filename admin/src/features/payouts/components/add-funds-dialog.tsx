import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import type { Stripe, StripeCardElement } from '@stripe/stripe-js';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { LoadingState, Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import {
  fundingAmountSchema,
  useCreateFunding,
  useRefreshFunding,
  type FundingAmountInput,
  type FundingAmountOutput,
  type FundingIntent,
} from '../api/create-funding';

export interface AddFundsDialogProps {
  studyId: string;
  currency: string;
  open: boolean;
  onClose: () => void;
  /** Called with the amount once the provider confirmed the card payment and the budget was refreshed. */
  onFunded: (amountMinor: number) => void;
}

/** Two steps: the amount (checked here and by the api), then the card, confirmed with the provider in the browser. */
export function AddFundsDialog({ studyId, currency, open, onClose, onFunded }: AddFundsDialogProps) {
  const [intent, setIntent] = useState<FundingIntent | null>(null);
  const close = () => {
    setIntent(null);
    onClose();
  };
  return (
    <ModalDialog
      open={open}
      onClose={close}
      title="Add funds by card"
      description="The money goes to this study's balance. Payouts can only be approved up to what is funded."
    >
      {intent ? (
        <CardStep
          studyId={studyId}
          intent={intent}
          onBack={() => setIntent(null)}
          onFunded={() => {
            onFunded(intent.amountMinor);
            close();
          }}
        />
      ) : (
        <AmountStep studyId={studyId} currency={currency} onCancel={close} onIntent={setIntent} />
      )}
    </ModalDialog>
  );
}

function AmountStep({
  studyId,
  currency,
  onCancel,
  onIntent,
}: {
  studyId: string;
  currency: string;
  onCancel: () => void;
  onIntent: (intent: FundingIntent) => void;
}) {
  const createFunding = useCreateFunding(studyId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<FundingAmountInput, unknown, FundingAmountOutput>({
    resolver: zodResolver(fundingAmountSchema(currency)),
    defaultValues: { amount: '' },
  });

  const onSubmit = handleSubmit(({ amount }) =>
    createFunding.mutate(amount, {
      onSuccess: onIntent,
      onError: (error) => {
        const fieldError =
          error instanceof ApiError ? error.fieldErrors.find((problem) => problem.field === 'amountMinor') : undefined;
        if (fieldError) setError('amount', { message: fieldError.message });
        else
          setError('root.server', {
            message: error instanceof ApiError ? error.message : 'The payment could not be started. Try again.',
          });
      },
    }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Amount to add">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField
        label={`Amount (${currency})`}
        hint={`In ${currency}, e.g. 500 or 500.00. At least ${formatMinor(100, currency, 'en-US')}.`}
        inputMode="decimal"
        autoComplete="off"
        error={errors.amount?.message}
        {...register('amount')}
      />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={createFunding.isPending}>
          Continue to card
        </Button>
      </DialogActions>
    </form>
  );
}

type CardState =
  | { phase: 'loading' }
  | { phase: 'ready'; complete: boolean }
  | { phase: 'paying' }
  | { phase: 'failed-to-load'; message: string };

function CardStep({
  studyId,
  intent,
  onBack,
  onFunded,
}: {
  studyId: string;
  intent: FundingIntent;
  onBack: () => void;
  onFunded: () => void;
}) {
  const mountNode = useRef<HTMLDivElement>(null);
  const stripeRef = useRef<Stripe | null>(null);
  const cardRef = useRef<StripeCardElement | null>(null);
  const [state, setState] = useState<CardState>({ phase: 'loading' });
  const [cardError, setCardError] = useState<string | null>(null);
  const refreshFunding = useRefreshFunding(studyId);

  useEffect(() => {
    let cancelled = false;
    let card: StripeCardElement | null = null;
    // Loaded on demand: the provider's script is already on the page (index.html), so nothing is fetched from the web.
    import('@stripe/stripe-js')
      .then(({ loadStripe }) => loadStripe(intent.publishableKey))
      .then((stripe) => {
        if (cancelled || !mountNode.current) return;
        if (!stripe) throw new Error('The card form is not available.');
        stripeRef.current = stripe;
        card = stripe.elements().create('card');
        card.on('change', (event) => {
          setCardError(event.error?.message ?? null);
          setState((current) => (current.phase === 'ready' ? { phase: 'ready', complete: event.complete } : current));
        });
        card.mount(mountNode.current);
        cardRef.current = card;
        setState({ phase: 'ready', complete: false });
      })
      .catch((error: unknown) => {
        if (!cancelled)
          setState({
            phase: 'failed-to-load',
            message: error instanceof Error ? error.message : 'The card form could not be loaded.',
          });
      });
    return () => {
      cancelled = true;
      card?.destroy();
    };
  }, [intent.publishableKey]);

  const pay = async () => {
    const stripe = stripeRef.current;
    const card = cardRef.current;
    if (!stripe || !card) return;
    setCardError(null);
    setState({ phase: 'paying' });
    const { paymentIntent, error } = await stripe.confirmCardPayment(intent.clientSecret, { payment_method: { card } });
    if (error || paymentIntent?.status !== 'succeeded') {
      setCardError(error?.message ?? 'The card payment was not completed. Check the card details and try again.');
      setState({ phase: 'ready', complete: true });
      return;
    }
    refreshFunding.mutate(intent.fundingId, {
      onSuccess: onFunded,
      onError: () => {
        // The payment went through; the budget will catch up when the provider's notice arrives.
        onFunded();
      },
    });
  };

  const paying = state.phase === 'paying' || refreshFunding.isPending;
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-ink">
        Paying <strong>{formatMinor(intent.amountMinor, intent.currency, 'en-US')}</strong> into this study's balance.
      </p>
      {state.phase === 'loading' && <LoadingState label="Loading the card form…" className="py-4" />}
      {state.phase === 'failed-to-load' && <Notice>{state.message}</Notice>}
      <div ref={mountNode} className="rounded-md border border-line p-3" />
      <div aria-live="assertive">{cardError && <Notice>{cardError}</Notice>}</div>
      <DialogActions>
        <Button onClick={onBack} disabled={paying}>
          Change amount
        </Button>
        <Button
          variant="primary"
          onClick={() => void pay()}
          pending={paying}
          disabled={state.phase !== 'ready' && state.phase !== 'paying'}
        >
          Pay {formatMinor(intent.amountMinor, intent.currency, 'en-US')}
        </Button>
      </DialogActions>
    </div>
  );
}
