// The payouts domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs). PayoutsService (the ledger) is its one service for others.
export * from './payout.exception';
export * from './payouts.module';
export * from './payouts.service';
