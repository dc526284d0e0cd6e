export type { paths, components, operations } from './generated/api-schema';
export * from './problem';
export * from './money';
export * from './client';

import type { components } from './generated/api-schema';
/** A named schema of the OpenAPI document, e.g. `Schema<'StudyDto'>`. */
export type Schema<Name extends keyof components['schemas']> = components['schemas'][Name];
export * from './session-fetch';
// The schemas themselves (zod at run time) are imported from '@evenhand/contract/schemas'; their types are here too.
export type * from './schemas';
