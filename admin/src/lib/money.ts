/** Digits after the decimal point in the currency's minor unit (ISO 4217), e.g. 2 for USD, 0 for JPY. */
export function currencyMinorDigits(currency: string): number {
  return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Whether the browser knows this three-letter code as a currency. */
export function isKnownCurrency(currency: string): boolean {
  if (!/^[A-Z]{3}$/.test(currency)) return false;
  try {
    new Intl.NumberFormat('en', { style: 'currency', currency });
    return true;
  } catch {
    return false;
  }
}

/** An amount kept in minor units (cents), shown in the currency's usual form, e.g. 1500 USD → "$15.00". */
export function formatMinor(minor: number, currency: string, locale?: string): string {
  const digits = currencyMinorDigits(currency);
  return new Intl.NumberFormat(locale, { style: 'currency', currency, minimumFractionDigits: digits, maximumFractionDigits: digits }).format(
    minor / 10 ** digits,
  );
}

/** Minor units as a plain editable major amount, e.g. 1500 USD → "15.00". */
export function minorToMajorText(minor: number, currency: string): string {
  const digits = currencyMinorDigits(currency);
  if (digits === 0) return String(minor);
  const whole = Math.trunc(minor / 10 ** digits);
  const fraction = String(Math.abs(minor % 10 ** digits)).padStart(digits, '0');
  return `${whole}.${fraction}`;
}

export type MajorAmountResult = { ok: true; minor: number } | { ok: false; message: string };

/**
 * Reads an amount typed in major units ("15", "15.5", "1,250.00") into whole minor units without floating-point
 * rounding: the digits are joined as text, so 0.29 USD is exactly 29 cents.
 */
export function parseMajorAmount(text: string, currency: string): MajorAmountResult {
  const cleaned = text.trim().replace(/[\s,]/g, '');
  if (cleaned === '') return { ok: false, message: 'Enter an amount.' };
  const match = /^(\d+)(?:\.(\d*))?$/.exec(cleaned);
  if (!match) return { ok: false, message: 'Enter an amount in numbers, like 15 or 15.50.' };
  const digits = currencyMinorDigits(currency);
  const whole = match[1] ?? '0';
  const fraction = (match[2] ?? '').replace(/0+$/, '');
  if (fraction.length > digits) {
    return {
      ok: false,
      message: digits === 0 ? `${currency} has no smaller unit; enter a whole amount.` : `${currency} amounts have at most ${digits} digits after the point.`,
    };
  }
  const minor = Number(whole + fraction.padEnd(digits, '0'));
  if (!Number.isSafeInteger(minor)) return { ok: false, message: 'This amount is too large.' };
  return { ok: true, minor };
}
