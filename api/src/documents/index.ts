export { DocumentError, DocumentErrorCode } from './document-error';
export * from './signed-consent-pdf';
