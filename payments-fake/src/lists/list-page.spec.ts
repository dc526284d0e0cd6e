import { describe, expect, it } from 'vitest';
import { ProviderError } from '../errors/provider-error';
import { parseFormBody } from '../encoding/form-body';
import { ParamReader } from '../encoding/param-reader';
import { LIST_LIMITS, listPage, readListQuery } from './list-page';

// Pagination rules as published at https://docs.stripe.com/api/pagination: newest first, limit
// 1-100 defaulting to 10, starting_after / ending_before cursors, has_more.
const items = Array.from({ length: 7 }, (_, i) => ({ id: `tr_${7 - i}` })); // tr_7 newest … tr_1 oldest

function query(encoded: string) {
  return readListQuery(new ParamReader(parseFormBody(encoded)));
}

describe('readListQuery', () => {
  it('defaults the limit to 10 and keeps it within 1..100', () => {
    expect(LIST_LIMITS).toEqual({ default: 10, min: 1, max: 100 });
    expect(query('').limit).toBe(10);
    expect(() => query('limit=0')).toThrow(ProviderError);
    expect(() => query('limit=101')).toThrow(ProviderError);
    expect(query('limit=100').limit).toBe(100);
  });

  it('refuses both cursors at once', () => {
    expect(() => query('starting_after=tr_3&ending_before=tr_5')).toThrow(ProviderError);
  });
});

describe('listPage', () => {
  it('gives the first page and says there is more', () => {
    expect(listPage(items, { limit: 3 }, '/v1/transfers', 'transfer')).toEqual({
      object: 'list',
      data: [{ id: 'tr_7' }, { id: 'tr_6' }, { id: 'tr_5' }],
      has_more: true,
      url: '/v1/transfers',
    });
  });

  it('pages forward after a cursor and stops at the end', () => {
    const page = listPage(items, { limit: 3, startingAfter: 'tr_5' }, '/v1/transfers', 'transfer');
    expect(page.data.map((item) => item.id)).toEqual(['tr_4', 'tr_3', 'tr_2']);
    expect(page.has_more).toBe(true);
    const last = listPage(items, { limit: 3, startingAfter: 'tr_2' }, '/v1/transfers', 'transfer');
    expect(last.data.map((item) => item.id)).toEqual(['tr_1']);
    expect(last.has_more).toBe(false);
  });

  it('pages backward before a cursor, keeping newest-first order', () => {
    const page = listPage(items, { limit: 2, endingBefore: 'tr_3' }, '/v1/transfers', 'transfer');
    expect(page.data.map((item) => item.id)).toEqual(['tr_5', 'tr_4']);
    expect(page.has_more).toBe(true);
    const top = listPage(items, { limit: 5, endingBefore: 'tr_5' }, '/v1/transfers', 'transfer');
    expect(top.data.map((item) => item.id)).toEqual(['tr_7', 'tr_6']);
    expect(top.has_more).toBe(false);
  });

  it('says no more when the page ends exactly at the last item', () => {
    expect(listPage(items, { limit: 7 }, '/v1/x', 'x').has_more).toBe(false);
    const exact = listPage(items, { limit: 3, startingAfter: 'tr_4' }, '/v1/x', 'x');
    expect(exact.data.map((item) => item.id)).toEqual(['tr_3', 'tr_2', 'tr_1']);
    expect(exact.has_more).toBe(false);
    expect(listPage(items, { limit: 2, endingBefore: 'tr_5' }, '/v1/x', 'x').has_more).toBe(false);
  });

  it('walking forward page by page sees every item exactly once, never ending on an empty page', () => {
    for (let limit = 1; limit <= 8; limit++) {
      const seen: string[] = [];
      let cursor: string | undefined;
      for (;;) {
        const page = listPage(items, { limit, startingAfter: cursor }, '/v1/x', 'x');
        expect(page.data.length).toBeGreaterThan(0);
        seen.push(...page.data.map((item) => item.id));
        if (!page.has_more) break;
        cursor = page.data.at(-1)?.id;
      }
      expect(seen).toEqual(items.map((item) => item.id));
    }
  });

  it('refuses an unknown cursor with resource_missing naming the cursor', () => {
    try {
      listPage(items, { limit: 3, startingAfter: 'tr_99' }, '/v1/transfers', 'transfer');
      throw new Error('expected an error');
    } catch (error) {
      expect((error as ProviderError).body).toMatchObject({ code: 'resource_missing', param: 'starting_after' });
    }
  });
});
