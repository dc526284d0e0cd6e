// Money is formatted and read in one place for the api and both apps: the contract (api/contract/src/money.ts).
export { formatMinor, isKnownCurrency, minorToMajorText, minorUnitDigits, parseMajorAmount } from '@evenhand/contract';
export type { MajorAmountResult } from '@evenhand/contract';
