// Events: GET /v1/events and /v1/events/:id (https://docs.stripe.com/api/events/list,
// https://docs.stripe.com/api/events/retrieve). `type` takes one type or a wildcard such as
// `payout.*`; `types[]` several exact types. The platform sees its own events; a connected
// account's events are read with its Stripe-Account header.

import type { ProviderRoute } from '../app/provider-route';
import { providerErrors } from '../errors/provider-error';
import type { ProviderEvent } from '../events/event-log';
import { listPage, readListQuery } from '../lists/list-page';

/** Whether an event type matches a `type` filter, which may end in `.*` (pure). */
export function eventTypeMatches(filter: string, type: string): boolean {
  if (filter === '*') return true;
  if (filter.endsWith('.*')) return type.startsWith(filter.slice(0, -1));
  return filter === type;
}

function scopeOf(isPlatform: boolean, accountId: string): string | undefined {
  return isPlatform ? undefined : accountId;
}

export const eventRoutes: ProviderRoute[] = [
  {
    method: 'get',
    path: '/v1/events',
    handle: (call, world) => {
      const { params } = call;
      const query = readListQuery(params);
      const type = params.string('type');
      const types = params.stringList('types');
      params.stringList('expand');
      params.finish();
      if (type !== undefined && types !== undefined) throw providerErrors.parametersExclusive(['type', 'types']);
      const matches = (event: ProviderEvent) =>
        (type === undefined || eventTypeMatches(type, event.type)) &&
        (types === undefined || types.includes(event.type));
      const events = world.events.newestFirst(scopeOf(call.account.isPlatform, call.account.id)).filter(matches);
      return structuredClone(listPage(events, query, '/v1/events', 'event'));
    },
  },
  {
    method: 'get',
    path: '/v1/events/:id',
    handle: (call, world) => {
      const id = call.pathParams.id as string;
      call.params.stringList('expand');
      call.params.finish();
      const event = world.events.get(id);
      if (!event || event.account !== scopeOf(call.account.isPlatform, call.account.id)) {
        throw providerErrors.resourceMissing('event', id);
      }
      return structuredClone(event);
    },
  },
];
