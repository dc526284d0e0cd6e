// Cursor pagination as the provider publishes it (https://docs.stripe.com/api/pagination):
// lists come newest first; `limit` 1-100 (default 10); `starting_after` gives the page after an
// object, `ending_before` the page before it; `has_more` says whether more lie in that direction.
// Pure: no framework imports.

import { providerErrors } from '../errors/provider-error';
import type { ParamReader } from '../encoding/param-reader';

export interface ListQuery {
  limit: number;
  startingAfter?: string;
  endingBefore?: string;
}

export interface ListObject<T> {
  object: 'list';
  data: T[];
  has_more: boolean;
  url: string;
}

export const LIST_LIMITS = { default: 10, min: 1, max: 100 } as const;

export function readListQuery(params: ParamReader): ListQuery {
  const limit = params.integer('limit', { min: LIST_LIMITS.min, max: LIST_LIMITS.max }) ?? LIST_LIMITS.default;
  const startingAfter = params.string('starting_after');
  const endingBefore = params.string('ending_before');
  if (startingAfter !== undefined && endingBefore !== undefined) {
    throw providerErrors.parametersExclusive(['starting_after', 'ending_before']);
  }
  return { limit, startingAfter, endingBefore };
}

/** One page of `newestFirst`, which must already be in the list's order. */
export function listPage<T extends { id: string }>(
  newestFirst: readonly T[],
  query: ListQuery,
  url: string,
  objectName: string,
): ListObject<T> {
  if (query.startingAfter !== undefined) {
    const cursor = newestFirst.findIndex((item) => item.id === query.startingAfter);
    if (cursor === -1) throw providerErrors.resourceMissing(objectName, query.startingAfter, 'starting_after');
    const after = newestFirst.slice(cursor + 1);
    return { object: 'list', data: after.slice(0, query.limit), has_more: after.length > query.limit, url };
  }
  if (query.endingBefore !== undefined) {
    const cursor = newestFirst.findIndex((item) => item.id === query.endingBefore);
    if (cursor === -1) throw providerErrors.resourceMissing(objectName, query.endingBefore, 'ending_before');
    const before = newestFirst.slice(0, cursor);
    const start = Math.max(0, before.length - query.limit);
    return { object: 'list', data: before.slice(start), has_more: start > 0, url };
  }
  return { object: 'list', data: newestFirst.slice(0, query.limit), has_more: newestFirst.length > query.limit, url };
}
