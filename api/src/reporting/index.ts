// The reporting module's public face: the read models that span domains. Other domains import from this file only
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export * from './account-emails.read-model';
export * from './finance.read-model';
export * from './participant-payouts.read-model';
export * from './payout-queue.read-model';
export * from './reporting.module';
export * from './roster.read-model';
export * from './screened-covariates.read-model';
export * from './signed-copy-recipients.read-model';
