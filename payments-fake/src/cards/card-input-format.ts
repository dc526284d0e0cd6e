// How the card form shows what is typed: the number in groups as printed on the card, the expiry
// as MM/YY, and where the caret goes after reformatting. Pure: no DOM, no framework imports.

import { type CardBrand, cardBrand, cardNumberLength, cvcLengths, digitsOf } from './card-checks';

// Grouping as embossed on cards (common practice): American Express 4-6-5, the others 4-4-4-4.
function groupSizes(brand: CardBrand): readonly number[] {
  return brand === 'amex' ? [4, 6, 5] : [4, 4, 4, 4];
}

/** The number as typed so far, cut to the brand's length and grouped with single spaces. */
export function formatCardNumber(text: string): string {
  const all = digitsOf(text);
  const brand = cardBrand(all);
  const digits = all.slice(0, cardNumberLength(brand));
  const groups: string[] = [];
  let start = 0;
  for (const size of groupSizes(brand)) {
    if (start >= digits.length) break;
    groups.push(digits.slice(start, start + size));
    start += size;
  }
  return groups.join(' ');
}

/** `MM/YY` from the digits typed so far; a first digit of 2–9 can only be a month 02–09. */
export function formatExpiry(text: string): string {
  let digits = digitsOf(text).slice(0, 4);
  if (digits.length === 1 && digits > '1') digits = `0${digits}`;
  if (digits.length <= 2) return digits;
  return `${digits.slice(0, 2)}/${digits.slice(2)}`;
}

export function formatCvc(text: string, brand: CardBrand): string {
  return digitsOf(text).slice(0, Math.max(...cvcLengths(brand)));
}

/** Where the caret belongs in `formatted` so that `digitsBefore` digits stand before it. */
export function caretAfterDigits(formatted: string, digitsBefore: number): number {
  if (digitsBefore <= 0) return 0;
  let seen = 0;
  for (let i = 0; i < formatted.length; i++) {
    if (/\d/.test(formatted[i] as string)) seen++;
    if (seen === digitsBefore) return i + 1;
  }
  return formatted.length;
}
