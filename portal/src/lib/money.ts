/** The portal speaks English, so amounts read the English way whatever the device's own settings are. */
export const PORTAL_LOCALE = 'en-US';

function currencyFormat(currency: string, locale: string, fractionDigits?: number): Intl.NumberFormat {
  try {
    return new Intl.NumberFormat(locale, {
      style: 'currency',
      currency,
      ...(fractionDigits === undefined ? {} : { minimumFractionDigits: fractionDigits, maximumFractionDigits: fractionDigits }),
    });
  } catch (cause) {
    throw new RangeError(`currency "${currency}" is not a currency code this browser knows (expected ISO 4217, like "USD")`, {
      cause,
    });
  }
}

/** How many digits the currency's minor unit has (its ISO 4217 exponent): 2 for USD, 0 for JPY, 3 for BHD. */
export function minorUnitDigits(currency: string): number {
  return currencyFormat(currency, PORTAL_LOCALE).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Whole minor units as an exact decimal string (1999, 2 → "19.99"), so no float rounding can creep in. */
export function minorUnitsToDecimal(minor: number, digits: number): `${number}` {
  if (!Number.isSafeInteger(minor)) throw new RangeError(`amount must be a whole number of minor units, got ${minor}`);
  const sign = minor < 0 ? '-' : '';
  const magnitude = String(Math.abs(minor)).padStart(digits + 1, '0');
  if (digits === 0) return `${sign}${magnitude}` as `${number}`;
  return `${sign}${magnitude.slice(0, -digits)}.${magnitude.slice(-digits)}` as `${number}`;
}

/** An amount held as integer minor units, shown in its currency: formatMoney(1250, 'USD') → "$12.50". */
export function formatMoney(minor: number, currency: string, locale: string = PORTAL_LOCALE): string {
  const digits = minorUnitDigits(currency);
  return currencyFormat(currency, locale, digits).format(minorUnitsToDecimal(minor, digits));
}
