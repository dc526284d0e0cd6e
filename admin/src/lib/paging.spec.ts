import { describe, expect, it } from 'vitest';
import { pageWindow, parsePageParam } from './paging';

// Row ranges follow the common practice of offset paging: offset = (page - 1) * pageSize, "41–45 of 45".
describe('pageWindow', () => {
  it('describes a middle page', () => {
    expect(pageWindow(2, 20, 45)).toEqual({
      firstRow: 21,
      lastRow: 40,
      pageCount: 3,
      hasPrevious: true,
      hasNext: true,
    });
  });

  it('describes a short last page', () => {
    expect(pageWindow(3, 20, 45)).toEqual({
      firstRow: 41,
      lastRow: 45,
      pageCount: 3,
      hasPrevious: true,
      hasNext: false,
    });
  });

  it('counts an exact multiple without an empty extra page', () => {
    expect(pageWindow(2, 20, 40)).toMatchObject({ lastRow: 40, pageCount: 2, hasNext: false });
  });

  it('shows one empty page for no rows', () => {
    expect(pageWindow(1, 20, 0)).toEqual({ firstRow: 0, lastRow: 0, pageCount: 1, hasPrevious: false, hasNext: false });
  });

  it('shows nothing, not a backwards range, past the end', () => {
    expect(pageWindow(4, 20, 45)).toMatchObject({ firstRow: 0, lastRow: 0, pageCount: 3, hasNext: false });
  });

  it('names the bad argument', () => {
    expect(() => pageWindow(0, 20, 5)).toThrow('page must be a whole number from 1, got 0');
    expect(() => pageWindow(1, 2.5, 5)).toThrow('pageSize must be a whole number from 1, got 2.5');
    expect(() => pageWindow(1, 20, -1)).toThrow('total must be a whole number from 0, got -1');
  });
});

describe('parsePageParam', () => {
  it.each([
    [null, 1],
    ['3', 3],
    ['0', 1],
    ['-2', 1],
    ['2.5', 1],
    ['abc', 1],
  ])('reads %s as page %i', (value, page) => {
    expect(parsePageParam(value)).toBe(page);
  });
});
