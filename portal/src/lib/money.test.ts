import { describe, expect, it } from 'vitest';
import { formatMoney, minorUnitDigits, minorUnitsToDecimal } from './money';

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
    expect(formatMoney(minor, currency)).toBe(text);
  });
});
