// The attrition domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export * from './attrition-input-error';
export * from './attrition-rates';
export * from './attrition-report';
export * from './chi-square';
export * from './condition-counts';
export * from './covariate-balance';
export * from './cox-model';
export * from './dropout-test';
export * from './fisher-exact';
export * from './kaplan-meier';
export * from './log-rank';
export * from './pay-parity';
export * from './planned-length';
export * from './stratified-tests';
export * from './sufficient-statistics';
export * from './wwc-boundaries';
export * from './wwc-verdict';
export * from './attrition.module';
export * from './attrition.service';
