import { describe, expect, it } from 'vitest';
import {
  cardBrand,
  checkCardEntry,
  checkCardNumber,
  checkCvc,
  checkExpiry,
  checkPostalCode,
  expiryProblem,
  passesLuhn,
  visibleProblem,
  type CardField,
} from './card-checks';
import { TEST_CARD_PAYMENT_METHODS } from './test-cards';

describe('passesLuhn', () => {
  it('accepts the worked example 79927398713 and refuses every other final digit', () => {
    // Wikipedia, "Luhn algorithm", example: account number 7992739871 has check digit 3.
    expect(passesLuhn('79927398713')).toBe(true);
    for (let digit = 0; digit <= 9; digit++) {
      if (digit !== 3) expect(passesLuhn(`7992739871${digit}`)).toBe(false);
    }
  });

  it('catches every single-digit typo and every swap of two different neighbouring digits', () => {
    // The Luhn check detects all single-digit errors and all adjacent transpositions except 09 ↔ 90
    // (Wikipedia, "Luhn algorithm", Strengths and weaknesses).
    const valid = '4242424242424242';
    for (let i = 0; i < valid.length; i++) {
      for (let digit = 0; digit <= 9; digit++) {
        const typo = valid.slice(0, i) + String(digit) + valid.slice(i + 1);
        if (typo !== valid) expect(passesLuhn(typo)).toBe(false);
      }
    }
    expect(passesLuhn('4242424242424224')).toBe(false);
    // The one swap it misses: 09 → 90 (18 and 9 both add 9 after casting out nines).
    expect(passesLuhn('0091')).toBe(passesLuhn('0901'));
  });

  it('holds for every test card number the provider publishes', () => {
    // https://docs.stripe.com/testing: all test card numbers are Luhn-valid.
    for (const number of Object.keys(TEST_CARD_PAYMENT_METHODS)) expect(passesLuhn(number), number).toBe(true);
  });

  it('refuses text that is not all digits, and single digits', () => {
    expect(passesLuhn('4242 4242 4242 4242')).toBe(false);
    expect(passesLuhn('0')).toBe(false);
    expect(passesLuhn('')).toBe(false);
  });
});

describe('cardBrand', () => {
  it('tells the networks apart by their prefixes', () => {
    // Test numbers per brand from https://docs.stripe.com/testing (from memory).
    expect(cardBrand('4242424242424242')).toBe('visa');
    expect(cardBrand('5555555555554444')).toBe('mastercard');
    expect(cardBrand('2223003122003222')).toBe('mastercard');
    expect(cardBrand('378282246310005')).toBe('amex');
    expect(cardBrand('6011111111111117')).toBe('discover');
    expect(cardBrand('3056930009020004')).toBe('unknown');
    expect(cardBrand('')).toBe('unknown');
  });
});

describe('checkCardNumber', () => {
  it('goes empty → incomplete → complete while typing a valid number', () => {
    expect(checkCardNumber('').status).toBe('empty');
    expect(checkCardNumber('4242 4242').status).toBe('incomplete');
    expect(checkCardNumber('4242 4242 4242 4242')).toEqual({ status: 'complete' });
    expect(checkCardNumber('3782 822463 10005')).toEqual({ status: 'complete' });
  });

  it('calls a full-length number that fails the Luhn check invalid', () => {
    expect(checkCardNumber('4242 4242 4242 4241')).toEqual({
      status: 'invalid',
      problem: { code: 'invalid_number', message: expect.stringContaining('not valid') },
    });
  });

  it('calls a number longer than its brand allows invalid', () => {
    expect(checkCardNumber('3782822463100050').status).toBe('invalid');
  });
});

describe('expiry', () => {
  const midMarch2026 = new Date(2026, 2, 15);

  it('takes the current month as still good, the month before as expired', () => {
    // A card is good through the last day of its expiry month (common practice of the networks).
    expect(expiryProblem(3, 2026, midMarch2026)).toBeUndefined();
    expect(expiryProblem(2, 2026, midMarch2026)?.code).toBe('invalid_expiry_month_past');
    expect(expiryProblem(12, 2025, midMarch2026)?.code).toBe('invalid_expiry_year_past');
    expect(expiryProblem(1, 27, midMarch2026)).toBeUndefined();
  });

  it('refuses months outside 1–12 and years more than 50 ahead', () => {
    expect(expiryProblem(0, 2030, midMarch2026)?.code).toBe('invalid_expiry_month');
    expect(expiryProblem(13, 2030, midMarch2026)?.code).toBe('invalid_expiry_month');
    expect(expiryProblem(1, 2076, midMarch2026)).toBeUndefined();
    expect(expiryProblem(1, 2077, midMarch2026)?.code).toBe('invalid_expiry_year');
  });

  it('reads MM/YY while typing', () => {
    expect(checkExpiry('', midMarch2026).status).toBe('empty');
    expect(checkExpiry('0', midMarch2026).status).toBe('incomplete');
    expect(checkExpiry('13', midMarch2026)).toMatchObject({
      status: 'invalid',
      problem: { code: 'invalid_expiry_month' },
    });
    expect(checkExpiry('03/2', midMarch2026).status).toBe('incomplete');
    expect(checkExpiry('03/26', midMarch2026)).toEqual({ status: 'complete' });
    expect(checkExpiry('02/26', midMarch2026)).toMatchObject({
      status: 'invalid',
      problem: { code: 'invalid_expiry_month_past' },
    });
    expect(checkExpiry('12 / 30', midMarch2026)).toEqual({ status: 'complete' });
  });
});

describe('checkCvc', () => {
  it('wants 3 digits, 4 for American Express, either for an unknown brand', () => {
    expect(checkCvc('12', 'visa').status).toBe('incomplete');
    expect(checkCvc('123', 'visa').status).toBe('complete');
    expect(checkCvc('1234', 'visa').status).toBe('invalid');
    expect(checkCvc('123', 'amex').status).toBe('incomplete');
    expect(checkCvc('1234', 'amex').status).toBe('complete');
    expect(checkCvc('123', 'unknown').status).toBe('complete');
    expect(checkCvc('1234', 'unknown').status).toBe('complete');
    expect(checkCvc('12a', 'visa').status).toBe('invalid');
  });
});

describe('checkPostalCode', () => {
  it('takes 3 to 10 letters, digits, spaces or hyphens', () => {
    expect(checkPostalCode('').status).toBe('empty');
    expect(checkPostalCode('12').status).toBe('incomplete');
    expect(checkPostalCode('12345').status).toBe('complete');
    expect(checkPostalCode('SW1A 1AA').status).toBe('complete');
    expect(checkPostalCode('12345-6789').status).toBe('complete');
    expect(checkPostalCode('<b>').status).toBe('invalid');
  });
});

describe('checkCardEntry', () => {
  const now = new Date(2026, 2, 15);
  const good = { number: '4242 4242 4242 4242', expiry: '12/30', cvc: '123', postalCode: '12345' };

  it('is complete when every shown field is, and empty when nothing is typed', () => {
    expect(checkCardEntry(good, { now, postalCodeShown: true })).toMatchObject({
      complete: true,
      empty: false,
      brand: 'visa',
    });
    const blank = checkCardEntry({ number: '', expiry: '', cvc: '', postalCode: '' }, { now, postalCodeShown: true });
    expect(blank).toMatchObject({ complete: false, empty: true, firstProblem: { code: 'incomplete_number' } });
  });

  it('needs the postal code only when it is shown', () => {
    const noPostal = { ...good, postalCode: '' };
    expect(checkCardEntry(noPostal, { now, postalCodeShown: true }).firstProblem?.code).toBe('incomplete_zip');
    expect(checkCardEntry(noPostal, { now, postalCodeShown: false }).complete).toBe(true);
  });

  it('reports the first problem in form order', () => {
    const check = checkCardEntry({ ...good, expiry: '01/20', cvc: '1' }, { now, postalCodeShown: true });
    expect(check.firstProblem?.code).toBe('invalid_expiry_year_past');
  });
});

describe('visibleProblem', () => {
  const now = new Date(2026, 2, 15);
  const entry = { number: '4242 42', expiry: '', cvc: '', postalCode: '' };

  it('keeps quiet about an incomplete field until the payer leaves it', () => {
    const check = checkCardEntry(entry, { now, postalCodeShown: true });
    expect(visibleProblem(check, new Set<CardField>(), 'number')).toBeUndefined();
    expect(visibleProblem(check, new Set<CardField>(['number']), 'expiry')?.problem.code).toBe('incomplete_number');
    // Coming back to the field hides the message again while they fix it.
    expect(visibleProblem(check, new Set<CardField>(['number']), 'number')).toBeUndefined();
  });

  it('shows an invalid field at once, and never an empty one', () => {
    const invalid = checkCardEntry({ ...entry, number: '4242 4242 4242 4241' }, { now, postalCodeShown: true });
    expect(visibleProblem(invalid, new Set<CardField>(), 'number')?.problem.code).toBe('invalid_number');
    const empty = checkCardEntry({ number: '', expiry: '', cvc: '', postalCode: '' }, { now, postalCodeShown: true });
    expect(visibleProblem(empty, new Set<CardField>(['number', 'expiry', 'cvc']), undefined)).toBeUndefined();
  });
});
