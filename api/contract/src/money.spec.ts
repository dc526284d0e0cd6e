import { describe, expect, it } from 'vitest';
import {
  formatMinor,
  isKnownCurrency,
  minorToMajorText,
  minorUnitDigits,
  minorUnitsToDecimal,
  parseMajorAmount,
} from './money';

describe('minor units of a currency', () => {
  // ISO 4217 list one (SIX Group, maintenance agency), column "Minor unit": USD 2, EUR 2, JPY 0, KRW 0, BHD 3, KWD 3.
  it.each([
    ['USD', 2],
    ['EUR', 2],
    ['JPY', 0],
    ['KRW', 0],
    ['BHD', 3],
    ['KWD', 3],
  ])('knows %s has %i decimal digits', (currency, digits) => {
    expect(minorUnitDigits(currency)).toBe(digits);
  });

  it('names the field and the problem for a currency that does not exist', () => {
    expect(() => minorUnitDigits('DOLLARS')).toThrow(/currency "DOLLARS" is not a currency code/);
  });
});

describe('minor units as an exact decimal', () => {
  it.each([
    [1999, 2, '19.99'],
    [5, 2, '0.05'],
    [0, 2, '0.00'],
    [-250, 2, '-2.50'],
    [1500, 0, '1500'],
    [1234, 3, '1.234'],
    // 2^53 − 1: divided as a float it would print ...740992, the string path keeps every digit.
    [9_007_199_254_740_991, 2, '90071992547409.91'],
  ])('%i with %i digits is %s', (minor, digits, decimal) => {
    expect(minorUnitsToDecimal(minor, digits)).toBe(decimal);
  });

  it('refuses an amount that is not whole minor units', () => {
    expect(() => minorUnitsToDecimal(12.5, 2)).toThrow('amount must be a whole number of minor units, got 12.5');
  });
});

describe('money as participants read it', () => {
  // Expected strings follow the Unicode CLDR en-US currency pattern "¤#,##0.00" with "$" for USD and "¥" for JPY
  // (CLDR main/en numbers.json and currencies.json); minus sign before the symbol as CLDR writes "-¤#,##0.00".
  it.each([
    [3000, 'USD', '$30.00'],
    [1250, 'USD', '$12.50'],
    [123456789, 'USD', '$1,234,567.89'],
    [-5, 'USD', '-$0.05'],
    [1500, 'JPY', '¥1,500'],
  ])('%i minor units of %s reads %s', (minor, currency, text) => {
    expect(formatMinor(minor, currency)).toBe(text);
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
    expect(parseMajorAmount('1.005', 'USD')).toEqual({
      ok: false,
      message: 'USD amounts have at most 2 digits after the point.',
    });
    expect(parseMajorAmount('10.5', 'JPY')).toEqual({
      ok: false,
      message: 'JPY has no smaller unit; enter a whole amount.',
    });
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

describe('amounts beyond what a float can divide exactly', () => {
  it('formats the largest safe integer with every digit', () => {
    expect(formatMinor(9_007_199_254_740_991, 'USD')).toBe('$90,071,992,547,409.91');
    expect(formatMinor(1005, 'BHD')).toBe('BHD\u00a01.005');
  });

  it('tells a person to type an amount above zero rather than "in numbers" for a negative amount', () => {
    expect(parseMajorAmount('-10', 'USD')).toEqual({ ok: false, message: 'Enter an amount above zero.' });
  });
});
