// Checks on what a payer types into the card form, shared by the browser script (while they type)
// and the REST stand-in (when a card arrives with a confirmation). Codes are the browser library's
// `validation_error` codes (from memory of https://docs.stripe.com/js/element/events/on_change);
// messages are our own wording. Pure: no DOM, no framework imports.

export type CardBrand = 'visa' | 'mastercard' | 'amex' | 'discover' | 'unknown';

export type CardField = 'number' | 'expiry' | 'cvc' | 'postalCode';

export const CARD_FIELDS: readonly CardField[] = ['number', 'expiry', 'cvc', 'postalCode'];

export type CardProblemCode =
  | 'incomplete_number'
  | 'invalid_number'
  | 'incomplete_expiry'
  | 'invalid_expiry_month'
  | 'invalid_expiry_year'
  | 'invalid_expiry_month_past'
  | 'invalid_expiry_year_past'
  | 'incomplete_cvc'
  | 'incomplete_zip';

export interface CardProblem {
  code: CardProblemCode;
  message: string;
}

const MESSAGES: Record<CardProblemCode, string> = {
  incomplete_number: 'The card number is incomplete.',
  invalid_number: 'The card number is not valid. Check the digits.',
  incomplete_expiry: 'The expiry date is incomplete.',
  invalid_expiry_month: 'The expiry month must be between 01 and 12.',
  invalid_expiry_year: 'The expiry year is too far in the future.',
  invalid_expiry_month_past: 'The card has expired: the expiry month is in the past.',
  invalid_expiry_year_past: 'The card has expired: the expiry year is in the past.',
  incomplete_cvc: 'The security code (CVC) is incomplete.',
  incomplete_zip: 'The postal code is incomplete.',
};

export function cardProblem(code: CardProblemCode): CardProblem {
  return { code, message: MESSAGES[code] };
}

export type FieldStatus = 'empty' | 'incomplete' | 'invalid' | 'complete';

/** One field's state; `problem` is what to say if the field is left like this (absent when complete). */
export interface FieldCheck {
  status: FieldStatus;
  problem?: CardProblem;
}

export function digitsOf(text: string): string {
  return text.replace(/\D/g, '');
}

/** Luhn (mod 10) check digit test, ISO/IEC 7812-1 Annex B; check values in card-checks.spec.ts. */
export function passesLuhn(digits: string): boolean {
  if (!/^\d{2,}$/.test(digits)) return false;
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let digit = digits.charCodeAt(digits.length - 1 - i) - 48;
    if (i % 2 === 1) {
      digit *= 2;
      if (digit > 9) digit -= 9;
    }
    sum += digit;
  }
  return sum % 10 === 0;
}

// Issuer prefixes of the card networks (common practice; ranges as the networks publish them,
// from memory: Mastercard added 2221–2720 in 2017).
const BRAND_PREFIXES: readonly [CardBrand, RegExp][] = [
  ['amex', /^3[47]/],
  ['visa', /^4/],
  ['mastercard', /^(5[1-5]|222[1-9]|22[3-9]\d|2[3-6]\d{2}|27[01]\d|2720)/],
  ['discover', /^(6011|64[4-9]|65)/],
];

export function cardBrand(digits: string): CardBrand {
  for (const [brand, prefix] of BRAND_PREFIXES) if (prefix.test(digits)) return brand;
  return 'unknown';
}

/** How many digits a complete number of this brand has (American Express 15, the others 16). */
export function cardNumberLength(brand: CardBrand): number {
  return brand === 'amex' ? 15 : 16;
}

/** Security code length: 4 on the front of American Express cards, 3 on the back of the others. */
export function cvcLengths(brand: CardBrand): readonly number[] {
  if (brand === 'amex') return [4];
  if (brand === 'unknown') return [3, 4];
  return [3];
}

export function checkCardNumber(text: string): FieldCheck {
  const digits = digitsOf(text);
  if (digits.length === 0) return { status: 'empty', problem: cardProblem('incomplete_number') };
  const length = cardNumberLength(cardBrand(digits));
  if (digits.length < length) return { status: 'incomplete', problem: cardProblem('incomplete_number') };
  if (digits.length > length || !passesLuhn(digits))
    return { status: 'invalid', problem: cardProblem('invalid_number') };
  return { status: 'complete' };
}

/** A card is good through the last day of its expiry month (common practice of the card networks). */
export function expiryProblem(month: number, year: number, now: Date): CardProblem | undefined {
  const fullYear = year < 100 ? 2000 + year : year;
  if (!Number.isInteger(month) || month < 1 || month > 12) return cardProblem('invalid_expiry_month');
  const thisYear = now.getFullYear();
  const thisMonth = now.getMonth() + 1;
  if (!Number.isInteger(fullYear) || fullYear < thisYear) return cardProblem('invalid_expiry_year_past');
  if (fullYear === thisYear && month < thisMonth) return cardProblem('invalid_expiry_month_past');
  // The browser library refuses expiry years more than 50 years ahead (from memory).
  if (fullYear > thisYear + 50) return cardProblem('invalid_expiry_year');
  return undefined;
}

export interface Expiry {
  month: number;
  /** Four digits. */
  year: number;
}

/** Reads `MM/YY` (or `MM / YY`, `MMYY`); undefined until all four digits are there. */
export function parseExpiry(text: string): Expiry | undefined {
  const digits = digitsOf(text);
  if (digits.length !== 4) return undefined;
  return { month: Number(digits.slice(0, 2)), year: 2000 + Number(digits.slice(2)) };
}

export function checkExpiry(text: string, now: Date): FieldCheck {
  const digits = digitsOf(text);
  if (digits.length === 0) return { status: 'empty', problem: cardProblem('incomplete_expiry') };
  if (digits.length >= 2) {
    const month = Number(digits.slice(0, 2));
    if (month < 1 || month > 12) return { status: 'invalid', problem: cardProblem('invalid_expiry_month') };
  }
  if (digits.length > 4) return { status: 'invalid', problem: cardProblem('invalid_expiry_year') };
  const expiry = parseExpiry(digits);
  if (!expiry) return { status: 'incomplete', problem: cardProblem('incomplete_expiry') };
  const problem = expiryProblem(expiry.month, expiry.year, now);
  return problem ? { status: 'invalid', problem } : { status: 'complete' };
}

export function checkCvc(text: string, brand: CardBrand): FieldCheck {
  const value = text.trim();
  if (value.length === 0) return { status: 'empty', problem: cardProblem('incomplete_cvc') };
  const lengths = cvcLengths(brand);
  if (/^\d+$/.test(value)) {
    if (lengths.includes(value.length)) return { status: 'complete' };
    if (value.length < Math.max(...lengths)) return { status: 'incomplete', problem: cardProblem('incomplete_cvc') };
  }
  return { status: 'invalid', problem: cardProblem('incomplete_cvc') };
}

/** Any postal code of 3 to 10 letters, digits, spaces or hyphens; countries differ too much to check more. */
export function checkPostalCode(text: string): FieldCheck {
  const value = text.trim();
  if (value.length === 0) return { status: 'empty', problem: cardProblem('incomplete_zip') };
  if (value.length < 3) return { status: 'incomplete', problem: cardProblem('incomplete_zip') };
  if (value.length > 10 || !/^[A-Za-z0-9 -]+$/.test(value))
    return { status: 'invalid', problem: cardProblem('incomplete_zip') };
  return { status: 'complete' };
}

export interface CardEntry {
  number: string;
  expiry: string;
  cvc: string;
  postalCode: string;
}

export interface CardEntryCheck {
  brand: CardBrand;
  fields: Record<CardField, FieldCheck>;
  /** No field has anything typed in it. */
  empty: boolean;
  /** Every field that is asked for is complete. */
  complete: boolean;
  /** The first field's problem in form order, to report when the payer submits. */
  firstProblem?: CardProblem;
}

export function checkCardEntry(entry: CardEntry, options: { now: Date; postalCodeShown: boolean }): CardEntryCheck {
  const brand = cardBrand(digitsOf(entry.number));
  const fields: Record<CardField, FieldCheck> = {
    number: checkCardNumber(entry.number),
    expiry: checkExpiry(entry.expiry, options.now),
    cvc: checkCvc(entry.cvc, brand),
    postalCode: options.postalCodeShown ? checkPostalCode(entry.postalCode) : { status: 'complete' },
  };
  const asked = CARD_FIELDS.filter((field) => field !== 'postalCode' || options.postalCodeShown);
  const firstProblem = asked.map((field) => fields[field]).find((check) => check.status !== 'complete')?.problem;
  return {
    brand,
    fields,
    empty: asked.every((field) => fields[field].status === 'empty'),
    complete: firstProblem === undefined,
    ...(firstProblem ? { firstProblem } : {}),
  };
}

/**
 * The problem the form shows while the payer is still typing: a field that cannot become right
 * by typing more (invalid) at once, and an incomplete one only after the payer has left it.
 */
export function visibleProblem(
  check: CardEntryCheck,
  left: ReadonlySet<CardField>,
  focused: CardField | undefined,
): { field: CardField; problem: CardProblem } | undefined {
  for (const field of CARD_FIELDS) {
    const fieldCheck = check.fields[field];
    if (!fieldCheck.problem) continue;
    if (fieldCheck.status === 'invalid') return { field, problem: fieldCheck.problem };
    if (fieldCheck.status === 'incomplete' && left.has(field) && focused !== field)
      return { field, problem: fieldCheck.problem };
  }
  return undefined;
}
