/**
 * Money travels as whole minor units (cents for USD, yen for JPY) and is turned into text only here, without
 * floating-point division: the decimal string is built from the integer's digits and handed to Intl, which
 * formats decimal strings exactly (ECMA-402 NumberFormat v3).
 */

/** Amounts read the English way in both apps, whatever the device's own settings are. */
export const MONEY_LOCALE = 'en-US';

function currencyFormat(currency: string, locale: string, fractionDigits?: number): Intl.NumberFormat {
  try {
    return new Intl.NumberFormat(locale, {
      style: 'currency',
      currency,
      ...(fractionDigits === undefined
        ? {}
        : { minimumFractionDigits: fractionDigits, maximumFractionDigits: fractionDigits }),
    });
  } catch (cause) {
    throw new RangeError(
      `currency "${currency}" is not a currency code this runtime knows (expected ISO 4217, like "USD")`,
      {
        cause,
      },
    );
  }
}

/** Whether the runtime knows this three-letter code as a currency. */
export function isKnownCurrency(currency: string): boolean {
  if (!/^[A-Z]{3}$/.test(currency)) return false;
  try {
    new Intl.NumberFormat('en', { style: 'currency', currency });
    return true;
  } catch {
    return false;
  }
}

/** How many digits the currency's minor unit has (its ISO 4217 exponent): 2 for USD, 0 for JPY, 3 for BHD. */
export function minorUnitDigits(currency: string): number {
  return currencyFormat(currency, MONEY_LOCALE).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Whole minor units as an exact decimal string (1999, 2 → "19.99"; -5, 2 → "-0.05"). */
export function minorUnitsToDecimal(minor: number, digits: number): `${number}` {
  if (!Number.isSafeInteger(minor)) throw new RangeError(`amount must be a whole number of minor units, got ${minor}`);
  const sign = minor < 0 ? '-' : '';
  const magnitude = String(Math.abs(minor)).padStart(digits + 1, '0');
  if (digits === 0) return `${sign}${magnitude}` as `${number}`;
  return `${sign}${magnitude.slice(0, -digits)}.${magnitude.slice(-digits)}` as `${number}`;
}

/** An amount held as whole minor units, shown in its currency: formatMinor(1250, 'USD') → "$12.50". */
export function formatMinor(minor: number, currency: string, locale: string = MONEY_LOCALE): string {
  const digits = minorUnitDigits(currency);
  // Intl's typings accept only numbers before TS's ES2023 Intl update; the string keeps every digit exact.
  return currencyFormat(currency, locale, digits).format(minorUnitsToDecimal(minor, digits) as unknown as number);
}

/** Minor units as a plain editable amount in major units, e.g. 1500 USD → "15.00". */
export function minorToMajorText(minor: number, currency: string): string {
  return minorUnitsToDecimal(minor, minorUnitDigits(currency));
}

export type MajorAmountResult = { ok: true; minor: number } | { ok: false; message: string };

/**
 * Reads an amount typed in major units ("15", "15.5", "1,250.00") into whole minor units without floating-point
 * rounding: the digits are joined as text, so 0.29 USD is exactly 29 cents.
 */
export function parseMajorAmount(text: string, currency: string): MajorAmountResult {
  const cleaned = text.trim().replace(/[\s,]/g, '');
  if (cleaned === '') return { ok: false, message: 'Enter an amount.' };
  if (cleaned.startsWith('-')) return { ok: false, message: 'Enter an amount above zero.' };
  const match = /^(\d+)(?:\.(\d*))?$/.exec(cleaned);
  if (!match) return { ok: false, message: 'Enter an amount in numbers, like 15 or 15.50.' };
  const digits = minorUnitDigits(currency);
  const whole = match[1] ?? '0';
  const fraction = (match[2] ?? '').replace(/0+$/, '');
  if (fraction.length > digits) {
    return {
      ok: false,
      message:
        digits === 0
          ? `${currency} has no smaller unit; enter a whole amount.`
          : `${currency} amounts have at most ${digits} digits after the point.`,
    };
  }
  const minor = Number(whole + fraction.padEnd(digits, '0'));
  if (!Number.isSafeInteger(minor)) return { ok: false, message: 'This amount is too large.' };
  return { ok: true, minor };
}
