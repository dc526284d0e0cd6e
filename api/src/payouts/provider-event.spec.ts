import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { readProviderEvent, signatureTimeProblem } from './provider-event';

const good = {
  id: 'evt_1',
  object: 'event',
  type: 'account.updated',
  created: 1_780_000_000,
  data: { object: { id: 'acct_1', object: 'account' } },
};

describe('readProviderEvent', () => {
  it('reads a well-formed event with its object id', () => {
    expect(readProviderEvent(good)).toEqual({
      event: {
        id: 'evt_1',
        type: 'account.updated',
        created: 1_780_000_000,
        object: good.data.object,
        objectId: 'acct_1',
      },
    });
  });

  it('names every missing top-level part', () => {
    expect(readProviderEvent({})).toEqual({
      errors: [
        expect.objectContaining({ field: 'id' }),
        expect.objectContaining({ field: 'type' }),
        expect.objectContaining({ field: 'created' }),
        expect.objectContaining({ field: 'data' }),
      ],
    });
  });

  it('refuses a null or listed data.object, and an applied type without an object id', () => {
    expect(readProviderEvent({ ...good, data: { object: null } })).toEqual({
      errors: [expect.objectContaining({ field: 'data.object' })],
    });
    expect(readProviderEvent({ ...good, data: { object: [] } })).toEqual({
      errors: [expect.objectContaining({ field: 'data.object' })],
    });
    expect(readProviderEvent({ ...good, type: 'transfer.created', data: { object: { object: 'transfer' } } })).toEqual({
      errors: [expect.objectContaining({ field: 'data.object.id' })],
    });
  });

  it('lets an event type we do not apply come without an object id', () => {
    const result = readProviderEvent({ ...good, type: 'balance.available', data: { object: { object: 'balance' } } });
    expect(result).toMatchObject({ event: { objectId: null } });
  });

  it('refuses a body that is not an object, and a created that is not unix seconds', () => {
    expect(readProviderEvent([1, 2])).toEqual({ errors: [expect.objectContaining({ field: 'body' })] });
    expect(readProviderEvent(null)).toEqual({ errors: [expect.objectContaining({ field: 'body' })] });
    expect(readProviderEvent({ ...good, created: '2026-01-01' })).toEqual({
      errors: [expect.objectContaining({ field: 'created' })],
    });
    expect(readProviderEvent({ ...good, created: 1.5 })).toEqual({
      errors: [expect.objectContaining({ field: 'created' })],
    });
  });
});

describe('signatureTimeProblem', () => {
  const now = 1_780_000_000;
  // Headers as the provider's SDK builds them (generateTestHeaderString), so the parsing matches the real format.
  const header = (timestamp: number) =>
    new Stripe('sk_test_x').webhooks.generateTestHeaderString({ payload: '{}', secret: 'whsec_x', timestamp });

  it('accepts five minutes either way and refuses anything beyond, in the future too', () => {
    expect(signatureTimeProblem(header(now), now)).toBeNull();
    expect(signatureTimeProblem(header(now + 300), now)).toBeNull();
    expect(signatureTimeProblem(header(now - 300), now)).toBeNull();
    expect(signatureTimeProblem(header(now + 301), now)).toMatch(/ahead/);
    expect(signatureTimeProblem(header(now + 400), now)).toMatch(/400 s ahead/);
    expect(signatureTimeProblem(header(now - 301), now)).toMatch(/behind/);
  });

  it('refuses a header without exactly one numeric timestamp', () => {
    expect(signatureTimeProblem('v1=abc', now)).toMatch(/timestamp/);
    expect(signatureTimeProblem(`t=${now},t=${now},v1=abc`, now)).toMatch(/timestamp/);
    expect(signatureTimeProblem('t=soon,v1=abc', now)).toMatch(/timestamp/);
  });
});
