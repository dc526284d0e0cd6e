// The randomization domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export type { FieldError } from './randomization-error';
export { RandomizationError, RandomizationErrorCode } from './randomization-error';
export * from './scheme-parameters';
export * from './seeded-stream';
export * from './strata';
export * from './commitment';
export * from './schemes/allocation-slot';
export * from './schemes/simple';
export * from './schemes/permuted-blocks';
export {
  generateStratifiedSequences,
  generateStratumSequence,
  stratumOfParticipant,
} from './schemes/stratified-blocks';
export * from './schemes/minimization';
export * from './schemes/matched-pairs';
export * from './within/counterbalance';
export * from './within/latin-square';
export * from './within/williams';
export * from './within/order-sequence';
export * from './derive-sequence';
export * from './dry-run';
export * from './randomization.module';
export * from './randomization.service';
export * from './study-design-snapshot';
