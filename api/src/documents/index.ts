// The documents domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export { DocumentError, DocumentErrorCode } from './document-error';
export * from './signed-consent-pdf';
export * from './documents.module';
export * from './documents.service';
