// Money is formatted in one place for the api and both apps: the contract (api/contract/src/money.ts).
export { formatMinor } from '@evenhand/contract';

/** The portal speaks English, so dates and amounts read the English way whatever the device's own settings are. */
export { MONEY_LOCALE as PORTAL_LOCALE } from '@evenhand/contract';
