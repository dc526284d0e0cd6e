// `expand[]` as the provider publishes it (https://docs.stripe.com/api/expanding_objects): a
// field holding an id can be replaced by the object itself; in lists the path starts with `data.`.
// Pure: no framework imports.

import { providerErrors } from '../errors/provider-error';

/** field name → looks up the object for the id the field holds (undefined leaves the id). */
export type Expanders = Record<string, (id: string) => unknown>;

function expandOne<T extends object>(object: T, field: string, expanders: Expanders, shownPath: string): T {
  const expander = expanders[field];
  if (!expander) throw providerErrors.notExpandable(shownPath);
  const value = (object as Record<string, unknown>)[field];
  if (typeof value !== 'string') return object;
  const expanded = expander(value);
  return expanded === undefined ? object : { ...object, [field]: expanded };
}

export function expandObject<T extends object>(
  object: T,
  paths: readonly string[] | undefined,
  expanders: Expanders,
): T {
  let out = object;
  for (const path of paths ?? []) out = expandOne(out, path, expanders, path);
  return out;
}

export function expandListData<T extends object>(
  data: readonly T[],
  paths: readonly string[] | undefined,
  expanders: Expanders,
): T[] {
  let out = [...data];
  for (const path of paths ?? []) {
    if (!path.startsWith('data.')) throw providerErrors.notExpandable(path);
    const field = path.slice('data.'.length);
    out = out.map((item) => expandOne(item, field, expanders, path));
  }
  return out;
}
