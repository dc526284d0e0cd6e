import { describe, expect, it } from 'vitest';
import { ProviderError } from '../errors/provider-error';
import { parseFormBody } from './form-body';
import { applyMetadataChange, METADATA_LIMITS, ParamReader } from './param-reader';

function reader(encoded: string): ParamReader {
  return new ParamReader(parseFormBody(encoded));
}

function failure(run: () => unknown): ProviderError {
  try {
    run();
  } catch (error) {
    if (error instanceof ProviderError) return error;
    throw error;
  }
  throw new Error('expected a ProviderError');
}

describe('ParamReader', () => {
  it('reads typed values', () => {
    const params = reader('amount=1500&confirm=true&currency=USD&country=de&email=p001%40evenhand.test');
    expect(params.integer('amount', { required: true, min: 1 })).toBe(1500);
    expect(params.boolean('confirm')).toBe(true);
    expect(params.currency('currency')).toBe('usd');
    expect(params.country('country')).toBe('DE');
    expect(params.email('email')).toBe('p001@evenhand.test');
    params.finish();
  });

  it('names a missing required parameter (parameter_missing, 400)', () => {
    const error = failure(() => reader('').integer('amount', { required: true }));
    expect(error.status).toBe(400);
    expect(error.body).toMatchObject({ type: 'invalid_request_error', code: 'parameter_missing', param: 'amount' });
  });

  it('refuses non-integers, fractions and out-of-range integers', () => {
    expect(failure(() => reader('amount=12.5').integer('amount')).body).toMatchObject({
      code: 'parameter_invalid_integer',
      param: 'amount',
      message: 'Invalid integer: 12.5',
    });
    expect(failure(() => reader('amount=abc').integer('amount')).body.code).toBe('parameter_invalid_integer');
    expect(failure(() => reader('amount=0').integer('amount', { min: 1 })).body.param).toBe('amount');
    expect(failure(() => reader('limit=101').integer('limit', { max: 100 })).body.param).toBe('limit');
    expect(failure(() => reader('amount=99999999999999999999').integer('amount')).body.code).toBe(
      'parameter_invalid_integer',
    );
  });

  it('treats an empty string as an attempt to unset (parameter_invalid_empty unless nullable)', () => {
    expect(failure(() => reader('description=').string('description')).body.code).toBe('parameter_invalid_empty');
    expect(reader('description=').nullableString('description')).toBeNull();
  });

  it('refuses a bad boolean, enum, currency, country and email, naming each', () => {
    expect(failure(() => reader('confirm=yes').boolean('confirm')).body.param).toBe('confirm');
    expect(failure(() => reader('type=premium').oneOf('type', ['express', 'custom'] as const)).body.param).toBe('type');
    expect(failure(() => reader('currency=dollars').currency('currency')).body.param).toBe('currency');
    expect(failure(() => reader('country=USA').country('country')).body.param).toBe('country');
    expect(failure(() => reader('email=nobody').email('email')).body).toMatchObject({
      code: 'email_invalid',
      param: 'email',
    });
  });

  it('accepts only absolute http(s) URLs where a URL is expected', () => {
    expect(reader('return_url=http%3A%2F%2F127.0.0.1%3A5173%2Fdone').url('return_url')).toBe(
      'http://127.0.0.1:5173/done',
    );
    expect(failure(() => reader('return_url=%2Fdone').url('return_url')).body.code).toBe('url_invalid');
    expect(failure(() => reader('return_url=javascript%3Aalert(1)').url('return_url')).body.code).toBe('url_invalid');
  });

  it('refuses the first unknown parameter, at any depth, in bracket notation', () => {
    const top = reader('type=express&colour=teal');
    top.string('type');
    expect(failure(() => top.finish()).body).toMatchObject({ code: 'parameter_unknown', param: 'colour' });

    const nested = reader('business_profile[name]=Lab&business_profile[slogan]=hi');
    nested.hash('business_profile')?.string('name');
    expect(failure(() => nested.finish()).body.param).toBe('business_profile[slogan]');
  });

  it('marks parameter errors as not kept for idempotent replay', () => {
    expect(failure(() => reader('').string('type', { required: true })).storable).toBe(false);
  });

  it('reads lists and refuses a plain value where a list is expected', () => {
    expect(reader('expand[]=a&expand[]=b').stringList('expand')).toEqual(['a', 'b']);
    expect(failure(() => reader('expand=a').stringList('expand')).body.param).toBe('expand');
  });
});

describe('metadata', () => {
  it('separates keys to set from keys to remove, and clears everything on an empty value', () => {
    expect(reader('metadata[a]=1&metadata[b]=').metadata()).toEqual({ clearAll: false, set: { a: '1' }, unset: ['b'] });
    expect(reader('metadata=').metadata()).toEqual({ clearAll: true, set: {}, unset: [] });
    expect(reader('').metadata()).toBeUndefined();
  });

  it('applies a change to the current metadata', () => {
    const current = { participant: 'p001', cohort: 'a' };
    expect(applyMetadataChange(current, { clearAll: false, set: { condition: 'x' }, unset: ['cohort'] })).toEqual({
      participant: 'p001',
      condition: 'x',
    });
    expect(applyMetadataChange(current, { clearAll: true, set: {}, unset: [] })).toEqual({});
    expect(current).toEqual({ participant: 'p001', cohort: 'a' });
  });

  // Limits as published at https://docs.stripe.com/metadata: 50 keys, 40-character keys, 500-character values.
  it('enforces the published limits', () => {
    expect(METADATA_LIMITS).toEqual({ keys: 50, keyLength: 40, valueLength: 500 });
    const key40 = 'k'.repeat(40);
    expect(reader(`metadata[${key40}]=v`).metadata()?.set).toEqual({ [key40]: 'v' });
    expect(failure(() => reader(`metadata[${'k'.repeat(41)}]=v`).metadata()).body.param).toBe(
      `metadata[${'k'.repeat(41)}]`,
    );
    expect(reader(`metadata[k]=${'v'.repeat(500)}`).metadata()?.set.k).toHaveLength(500);
    expect(failure(() => reader(`metadata[k]=${'v'.repeat(501)}`).metadata()).body.param).toBe('metadata[k]');
    const fifty = Object.fromEntries(Array.from({ length: 50 }, (_, i) => [`k${i}`, 'v']));
    expect(Object.keys(applyMetadataChange(fifty, undefined))).toHaveLength(50);
    expect(
      failure(() => applyMetadataChange(fifty, { clearAll: false, set: { extra: 'v' }, unset: [] })).body.param,
    ).toBe('metadata');
  });

  it('refuses a nested value inside metadata', () => {
    expect(failure(() => reader('metadata[a][b]=1').metadata()).body.param).toBe('metadata[a]');
  });
});
