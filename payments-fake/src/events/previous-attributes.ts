// `data.previous_attributes` of an *.updated event (https://docs.stripe.com/api/events/object):
// the earlier values of the fields that changed. Pure: no framework imports.

import { canonicalJson } from '../idempotency/canonical-json';

export function previousAttributes(before: object, after: object): Record<string, unknown> {
  const earlier = before as Record<string, unknown>;
  const later = after as Record<string, unknown>;
  const changed: Record<string, unknown> = {};
  const keys = new Set([...Object.keys(earlier), ...Object.keys(later)]);
  for (const key of keys) {
    if (canonicalJson(earlier[key]) !== canonicalJson(later[key])) changed[key] = earlier[key] ?? null;
  }
  return changed;
}
