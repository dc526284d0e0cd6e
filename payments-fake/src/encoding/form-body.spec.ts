import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FormBodyError, paramName, parseFormBody, splitBracketKey } from './form-body';

describe('splitBracketKey', () => {
  it('splits nested and list keys', () => {
    expect(splitBracketKey('amount')).toEqual(['amount']);
    expect(splitBracketKey('capabilities[transfers][requested]')).toEqual(['capabilities', 'transfers', 'requested']);
    expect(splitBracketKey('expand[]')).toEqual(['expand', '']);
    expect(splitBracketKey('expand[0]')).toEqual(['expand', '0']);
  });

  it('refuses unbalanced brackets and a missing name', () => {
    expect(() => splitBracketKey('metadata[a')).toThrow(FormBodyError);
    expect(() => splitBracketKey('[a]')).toThrow(FormBodyError);
    expect(() => splitBracketKey('a[b]c')).toThrow(FormBodyError);
  });
});

describe('parseFormBody', () => {
  it('builds nested hashes from bracket keys', () => {
    expect(parseFormBody('type=express&capabilities[transfers][requested]=true&metadata[study]=s1')).toEqual({
      type: 'express',
      capabilities: { transfers: { requested: 'true' } },
      metadata: { study: 's1' },
    });
  });

  it('builds lists from empty brackets and from indices', () => {
    expect(parseFormBody('expand[]=destination&expand[]=balance_transaction')).toEqual({
      expand: ['destination', 'balance_transaction'],
    });
    expect(parseFormBody('expand[0]=destination&expand[1]=balance_transaction')).toEqual({
      expand: ['destination', 'balance_transaction'],
    });
    expect(parseFormBody('items[0][price]=p1&items[0][quantity]=2&items[1][price]=p2')).toEqual({
      items: [{ price: 'p1', quantity: '2' }, { price: 'p2' }],
    });
  });

  it('keeps empty values, which the provider reads as "unset"', () => {
    expect(parseFormBody('metadata=&description=')).toEqual({ metadata: '', description: '' });
    expect(parseFormBody('metadata[old]=')).toEqual({ metadata: { old: '' } });
  });

  it('decodes values exactly as the WHATWG URLSearchParams reference does', () => {
    // Outside reference: Node's URLSearchParams implements the WHATWG application/x-www-form-urlencoded parser.
    const encoded = 'note=a+b%26c%3D%C3%A9&empty=&plus=%2B&space=%20x&emoji=%F0%9F%8C%8A';
    const reference = Object.fromEntries(new URLSearchParams(encoded));
    expect(parseFormBody(encoded)).toEqual(reference);
  });

  it('decodes percent-encoded brackets in keys', () => {
    expect(parseFormBody('metadata%5Bstudy%5D=s1')).toEqual({ metadata: { study: 's1' } });
  });

  it('keeps the last value of a repeated plain key', () => {
    expect(parseFormBody('limit=3&limit=5')).toEqual({ limit: '5' });
  });

  it('refuses a key sent both as a value and as a hash', () => {
    expect(() => parseFormBody('metadata=x&metadata[a]=b')).toThrow(FormBodyError);
    expect(() => parseFormBody('metadata[a]=b&metadata=x')).toThrow(FormBodyError);
  });

  it('refuses reserved names that would reach the object prototype', () => {
    expect(() => parseFormBody('__proto__[polluted]=yes')).toThrow(FormBodyError);
    expect(() => parseFormBody('metadata[constructor][prototype]=yes')).toThrow(FormBodyError);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('refuses broken percent-encoding and very deep nesting', () => {
    expect(() => parseFormBody('a=%E0%A4%A')).toThrow(FormBodyError);
    expect(() => parseFormBody('a[b][c][d][e][f][g][h][i]=1')).toThrow(FormBodyError);
  });

  it('reads an empty body and a leading question mark', () => {
    expect(parseFormBody('')).toEqual({});
    expect(parseFormBody('?limit=3')).toEqual({ limit: '3' });
  });
});

describe('paramName', () => {
  it('writes nested names the way the provider writes `param`', () => {
    expect(paramName(['capabilities', 'transfers', 'requested'])).toBe('capabilities[transfers][requested]');
    expect(paramName(['amount'])).toBe('amount');
  });
});

// Outside reference: whatever the official SDK encodes must decode back to the same values.
describe('round trip through the official SDK encoder', () => {
  let server: Server;
  let port = 0;
  const bodies: string[] = [];

  beforeAll(async () => {
    server = createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (chunk: Buffer) => chunks.push(chunk));
      req.on('end', () => {
        bodies.push(Buffer.concat(chunks).toString('utf8'));
        res.writeHead(200, { 'Content-Type': 'application/json' }).end('{"id":"acct_x","object":"account"}');
      });
    });
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    port = (server.address() as AddressInfo).port;
  });
  afterAll(
    () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  );

  it('decodes nested hashes, lists, numbers, booleans and unicode sent by the SDK', async () => {
    const stripe = new Stripe('sk_test_encoder', {
      host: '127.0.0.1',
      port,
      protocol: 'http',
      maxNetworkRetries: 0,
      telemetry: false,
    });
    await stripe.accounts.create({
      type: 'express',
      email: 'p+tag@evenhand.test',
      capabilities: { transfers: { requested: true }, card_payments: { requested: false } },
      metadata: { note: 'Café & co = 100%', 'key with space': '[brackets]' },
      expand: ['business_profile', 'external_accounts'],
      tos_acceptance: { date: 1_700_000_000 },
    });
    expect(parseFormBody(bodies.at(-1) ?? '')).toEqual({
      type: 'express',
      email: 'p+tag@evenhand.test',
      capabilities: { transfers: { requested: 'true' }, card_payments: { requested: 'false' } },
      metadata: { note: 'Café & co = 100%', 'key with space': '[brackets]' },
      expand: ['business_profile', 'external_accounts'],
      tos_acceptance: { date: '1700000000' },
    });
  });
});
