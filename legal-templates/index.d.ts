export type TemplateKind = 'consent' | 'email';

export interface LegalTemplate {
  /** Stable id, e.g. `consent/minimal-risk-paid-study`; stored on a consent version as its template id. */
  readonly id: string;
  readonly kind: TemplateKind;
  readonly version: number;
  readonly title: string;
  /** Mustache subject line (e-mail templates only). */
  readonly subject?: string;
  /** Path relative to the package, and the absolute path. */
  readonly file: string;
  readonly path: string;
  /** The placeholder names the template uses. */
  readonly fields: readonly string[];
  /** For staff: the template is a starting point for the ethics board, not legal advice. */
  readonly notice: string;
}

export declare const STAFF_NOTICE: string;
export declare const templates: readonly LegalTemplate[];
export declare const fonts: {
  readonly family: string;
  readonly version: string;
  /** Absolute paths of the TrueType files and their licence. */
  readonly regular: string;
  readonly bold: string;
  readonly licence: string;
};
/** Throws naming `templateId` when the id is unknown. */
export declare function findTemplate(id: string): LegalTemplate;
export declare function readTemplateSource(id: string): string;
