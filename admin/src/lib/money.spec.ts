import { describe, expect, it } from 'vitest';
import { currencyMinorDigits, formatMinor, isKnownCurrency, minorToMajorText, parseMajorAmount } from './money';

describe('currencyMinorDigits', () => {
  // ISO 4217 list one (SIX Financial Information), column "Minor unit": USD 2, EUR 2, JPY 0, KRW 0, BHD 3, KWD 3.
  it.each([
    ['USD', 2],
    ['EUR', 2],
    ['JPY', 0],
    ['KRW', 0],
    ['BHD', 3],
    ['KWD', 3],
  ])('gives %s %i minor digits as ISO 4217 lists', (currency, digits) => {
    expect(currencyMinorDigits(currency)).toBe(digits);
  });
});

describe('parseMajorAmount', () => {
  it('turns 0.29 dollars into exactly 29 cents, where 0.29 * 100 in floating point is 28.999999999999996', () => {
    expect(0.29 * 100).not.toBe(29);
    expect(parseMajorAmount('0.29', 'USD')).toEqual({ ok: true, minor: 29 });
  });

  it('reads whole amounts, one decimal, thousands separators and trailing zeros', () => {
    expect(parseMajorAmount('15', 'USD')).toEqual({ ok: true, minor: 1500 });
    expect(parseMajorAmount('15.5', 'USD')).toEqual({ ok: true, minor: 1550 });
    expect(parseMajorAmount('6,000.00', 'USD')).toEqual({ ok: true, minor: 600000 });
    expect(parseMajorAmount('1500', 'JPY')).toEqual({ ok: true, minor: 1500 });
    expect(parseMajorAmount('1.250', 'BHD')).toEqual({ ok: true, minor: 1250 });
  });

  it('refuses more decimals than the currency has, text and negative amounts', () => {
    expect(parseMajorAmount('1.005', 'USD')).toEqual({ ok: false, message: 'USD amounts have at most 2 digits after the point.' });
    expect(parseMajorAmount('10.5', 'JPY')).toEqual({ ok: false, message: 'JPY has no smaller unit; enter a whole amount.' });
    expect(parseMajorAmount('ten', 'USD').ok).toBe(false);
    expect(parseMajorAmount('-5', 'USD').ok).toBe(false);
    expect(parseMajorAmount(' ', 'USD')).toEqual({ ok: false, message: 'Enter an amount.' });
  });
});

describe('formatMinor and minorToMajorText', () => {
  it('shows minor units in major units', () => {
    expect(formatMinor(3700, 'USD', 'en-US')).toBe('$37.00');
    expect(formatMinor(1500, 'JPY', 'en-US')).toBe('¥1,500');
    expect(minorToMajorText(1205, 'USD')).toBe('12.05');
    expect(minorToMajorText(1500, 'JPY')).toBe('1500');
  });

  it('round-trips through the editable text', () => {
    for (const minor of [0, 1, 9, 10, 99, 100, 123456]) {
      expect(parseMajorAmount(minorToMajorText(minor, 'USD'), 'USD')).toEqual({ ok: true, minor });
    }
  });
});

describe('isKnownCurrency', () => {
  it('accepts ISO codes and refuses lower case or made-up shapes', () => {
    expect(isKnownCurrency('USD')).toBe(true);
    expect(isKnownCurrency('usd')).toBe(false);
    expect(isKnownCurrency('US')).toBe(false);
  });
});
