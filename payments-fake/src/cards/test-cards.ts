// The provider's published test card numbers and the test payment method each one stands for
// (https://docs.stripe.com/testing, "Cards by brand" and "Declined payments"; numbers from memory
// of that page). A card typed into the browser script arrives with its number; the stand-in
// confirms with the matching test payment method. Pure: no framework imports.

export const TEST_CARD_PAYMENT_METHODS: Readonly<Record<string, string>> = {
  '4242424242424242': 'pm_card_visa',
  '4000056655665556': 'pm_card_visa_debit',
  '5555555555554444': 'pm_card_mastercard',
  '378282246310005': 'pm_card_amex',
  '6011111111111117': 'pm_card_discover',
  '4000000000000077': 'pm_card_bypassPending',
  '4000000000000002': 'pm_card_chargeDeclined',
  '4000000000009995': 'pm_card_chargeDeclinedInsufficientFunds',
  '4000000000000069': 'pm_card_chargeDeclinedExpiredCard',
};

/** The test payment method for a card number (spaces allowed), or undefined for any other number. */
export function testPaymentMethodForCard(number: string): string | undefined {
  return TEST_CARD_PAYMENT_METHODS[number.replace(/[\s-]/g, '')];
}
