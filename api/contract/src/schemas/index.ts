export * from './field-errors';
export * from './scheme-parameters';
export * from './assignment';
export * from './dry-run';
export * from './consent-values';
export * from './openapi';
