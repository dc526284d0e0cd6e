// The consent domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export type { FieldError } from './consent-error';
export { ConsentError, ConsentErrorCode } from './consent-error';
export * from './consent-text';
export * from './consent-changes';
export * from './consent-markdown';
export * from './consent-outline';
export * from './consent-template';
export * from './consent-emails';
export * from './markdown-escape';
export * from './reading-time';
export * from './required-elements';
export * from './required-elements-check';
export * from './study-formatting';
export * from './template-rendering';
export * from './consent.module';
export * from './consent.service';
export * from './entities/consent-version.entity';
