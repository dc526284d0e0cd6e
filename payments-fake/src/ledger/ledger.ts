// Balances per account and currency, split as the provider's Balance object splits them
// (https://docs.stripe.com/api/balance/balance_object): `available` can be transferred or paid out
// now; `pending` becomes available later. Amounts are integers in the currency's smallest unit.
// Pure: no framework imports.

import { providerErrors } from '../errors/provider-error';

export interface CurrencyAmount {
  amount: number;
  currency: string;
}

export interface BalanceSplit {
  available: CurrencyAmount[];
  pending: CurrencyAmount[];
}

export interface PendingFunds {
  accountId: string;
  currency: string;
  amount: number;
  /** When the funds become available, on the stand-in's clock (ms). */
  availableOnMs: number;
}

/** The ledger as the state file keeps it: available amounts and pending funds with their release times. */
export interface LedgerSnapshot {
  available: Array<{ accountId: string; currency: string; amount: number }>;
  pending: PendingFunds[];
}

export interface ReleasedFunds {
  accountId: string;
  currency: string;
  amount: number;
}

function assertAmount(amount: number): void {
  if (!Number.isSafeInteger(amount))
    throw new RangeError(`amount must be an integer number of minor units, got ${amount}`);
}

export class Ledger {
  private readonly available = new Map<string, Map<string, number>>();
  private pending: PendingFunds[] = [];

  private wallet(accountId: string): Map<string, number> {
    let wallet = this.available.get(accountId);
    if (!wallet) {
      wallet = new Map();
      this.available.set(accountId, wallet);
    }
    return wallet;
  }

  availableAmount(accountId: string, currency: string): number {
    return this.available.get(accountId)?.get(currency) ?? 0;
  }

  pendingAmount(accountId: string, currency: string): number {
    return this.pending
      .filter((funds) => funds.accountId === accountId && funds.currency === currency)
      .reduce((sum, funds) => sum + funds.amount, 0);
  }

  setAvailable(accountId: string, currency: string, amount: number): void {
    assertAmount(amount);
    this.wallet(accountId).set(currency, amount);
  }

  creditAvailable(accountId: string, currency: string, amount: number): void {
    assertAmount(amount);
    const wallet = this.wallet(accountId);
    wallet.set(currency, (wallet.get(currency) ?? 0) + amount);
  }

  creditPending(accountId: string, currency: string, amount: number, availableOnMs: number): void {
    assertAmount(amount);
    this.pending.push({ accountId, currency, amount, availableOnMs });
  }

  /** Takes `amount` from the available balance, or refuses with `balance_insufficient`. */
  debitAvailable(accountId: string, currency: string, amount: number): void {
    assertAmount(amount);
    const current = this.availableAmount(accountId, currency);
    if (current < amount) throw providerErrors.balanceInsufficient(currency);
    this.wallet(accountId).set(currency, current - amount);
  }

  /** Moves pending funds whose date has come (all of them when `nowMs` is Infinity) to available. */
  releaseDue(nowMs: number): ReleasedFunds[] {
    const due = this.pending.filter((funds) => funds.availableOnMs <= nowMs);
    this.pending = this.pending.filter((funds) => funds.availableOnMs > nowMs);
    for (const funds of due) this.creditAvailable(funds.accountId, funds.currency, funds.amount);
    return due.map(({ accountId, currency, amount }) => ({ accountId, currency, amount }));
  }

  nextReleaseMs(): number | undefined {
    if (this.pending.length === 0) return undefined;
    return Math.min(...this.pending.map((funds) => funds.availableOnMs));
  }

  /** The account's balance by currency; a currency it never held still shows as zero in `defaultCurrency`. */
  split(accountId: string, defaultCurrency: string): BalanceSplit {
    const currencies = new Set<string>([defaultCurrency]);
    for (const currency of this.available.get(accountId)?.keys() ?? []) currencies.add(currency);
    for (const funds of this.pending) if (funds.accountId === accountId) currencies.add(funds.currency);
    const sorted = [...currencies].sort();
    return {
      available: sorted.map((currency) => ({ amount: this.availableAmount(accountId, currency), currency })),
      pending: sorted.map((currency) => ({ amount: this.pendingAmount(accountId, currency), currency })),
    };
  }

  clear(): void {
    this.available.clear();
    this.pending = [];
  }

  toSnapshot(): LedgerSnapshot {
    const available: LedgerSnapshot['available'] = [];
    for (const [accountId, wallet] of this.available) {
      for (const [currency, amount] of wallet) available.push({ accountId, currency, amount });
    }
    return { available, pending: this.pending.map((funds) => ({ ...funds })) };
  }

  restoreSnapshot(snapshot: LedgerSnapshot): void {
    this.clear();
    for (const { accountId, currency, amount } of snapshot.available) this.setAvailable(accountId, currency, amount);
    for (const { accountId, currency, amount, availableOnMs } of snapshot.pending) {
      this.creditPending(accountId, currency, amount, availableOnMs);
    }
  }
}
