import { describe, expect, it } from 'vitest';
import { parseFormBody } from '../encoding/form-body';
import { encodeForm } from './form-encoding';

describe('encodeForm', () => {
  it('writes nested hashes and lists with bracket keys, percent-encoded', () => {
    const body = encodeForm({
      client_secret: 'pi_1_secret_2',
      payment_method_data: { type: 'card', card: { exp_month: 12 } },
      expand: ['payment_method'],
    });
    expect(body).toBe(
      'client_secret=pi_1_secret_2&payment_method_data%5Btype%5D=card&payment_method_data%5Bcard%5D%5Bexp_month%5D=12&expand%5B0%5D=payment_method',
    );
  });

  it('reads back the same through URLSearchParams, the WHATWG form decoder', () => {
    // Outside reference: the platform's own application/x-www-form-urlencoded parser.
    const body = encodeForm({ billing_details: { name: 'Ada & Co = 100%', address: { postal_code: '12 345' } } });
    expect([...new URLSearchParams(body)]).toEqual([
      ['billing_details[name]', 'Ada & Co = 100%'],
      ['billing_details[address][postal_code]', '12 345'],
    ]);
  });

  it('round-trips through the stand-in’s own decoder and leaves out empty values', () => {
    const body = encodeForm({ a: { b: 'x', c: undefined, d: null }, e: true, f: ['1', '2'] });
    expect(parseFormBody(body)).toEqual({ a: { b: 'x' }, e: 'true', f: ['1', '2'] });
  });
});
