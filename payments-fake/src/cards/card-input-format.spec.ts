import { describe, expect, it } from 'vitest';
import { caretAfterDigits, formatCardNumber, formatCvc, formatExpiry } from './card-input-format';

describe('formatCardNumber', () => {
  it('groups as printed on the card: 4-4-4-4, American Express 4-6-5', () => {
    // Groupings as embossed on the cards (common practice).
    expect(formatCardNumber('4242424242424242')).toBe('4242 4242 4242 4242');
    expect(formatCardNumber('378282246310005')).toBe('3782 822463 10005');
    expect(formatCardNumber('42424')).toBe('4242 4');
  });

  it('drops anything that is not a digit and cuts at the brand length', () => {
    expect(formatCardNumber('4242-4242 abc 4242 42429999')).toBe('4242 4242 4242 4242');
    expect(formatCardNumber('3782822463100059')).toBe('3782 822463 10005');
    expect(formatCardNumber('')).toBe('');
  });
});

describe('formatExpiry', () => {
  it('writes MM/YY, putting the slash in only once the year starts', () => {
    expect(formatExpiry('1')).toBe('1');
    expect(formatExpiry('12')).toBe('12');
    expect(formatExpiry('123')).toBe('12/3');
    expect(formatExpiry('1234')).toBe('12/34');
    expect(formatExpiry('12/345')).toBe('12/34');
  });

  it('reads a first digit of 2–9 as the month 02–09', () => {
    expect(formatExpiry('4')).toBe('04');
    expect(formatExpiry('0')).toBe('0');
  });
});

describe('formatCvc', () => {
  it('keeps at most 3 digits, 4 for American Express', () => {
    expect(formatCvc('12345', 'visa')).toBe('123');
    expect(formatCvc('12345', 'amex')).toBe('1234');
    expect(formatCvc('1a2', 'visa')).toBe('12');
  });
});

describe('caretAfterDigits', () => {
  it('puts the caret after the same digits once spaces or the slash are added', () => {
    expect(caretAfterDigits('4242 4242', 4)).toBe(4);
    expect(caretAfterDigits('4242 4242', 5)).toBe(6);
    expect(caretAfterDigits('12/3', 3)).toBe(4);
    expect(caretAfterDigits('12/3', 0)).toBe(0);
    expect(caretAfterDigits('12', 9)).toBe(2);
  });
});
