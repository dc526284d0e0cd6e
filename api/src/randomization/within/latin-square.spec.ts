import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { counterbalancedOrders } from './counterbalance';
import { cyclicLatinSquare, isLatinSquare } from './latin-square';

describe('cyclic Latin square', () => {
  it('has each condition once in every order and once in every position', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.string({ minLength: 1, maxLength: 6 }), { minLength: 3, maxLength: 15 }), (ids) => {
        const square = cyclicLatinSquare(ids);
        expect(square).toHaveLength(ids.length);
        for (const order of square) expect(order.slice().sort()).toEqual(ids.slice().sort());
        for (let position = 0; position < ids.length; position++) {
          expect(new Set(square.map((order) => order[position])).size).toBe(ids.length);
        }
        expect(isLatinSquare(square)).toBe(true);
        expect(square[0]).toEqual(ids);
      }),
    );
  });

  it('for 3 conditions is A B C / B C A / C A B', () => {
    // Outside check: the cyclic (standard) Latin square of order 3, common practice.
    expect(cyclicLatinSquare(['A', 'B', 'C'])).toEqual([
      ['A', 'B', 'C'],
      ['B', 'C', 'A'],
      ['C', 'A', 'B'],
    ]);
  });

  it('tells a Latin square from arrangements that are not one', () => {
    expect(
      isLatinSquare([
        ['A', 'B', 'C'],
        ['B', 'C', 'A'],
        ['B', 'A', 'C'],
      ]),
    ).toBe(false);
    expect(
      isLatinSquare([
        ['A', 'B'],
        ['B', 'A'],
        ['A', 'B'],
      ]),
    ).toBe(false);
    expect(isLatinSquare([])).toBe(false);
  });

  it('refuses fewer than three conditions; two take AB/BA counterbalancing', () => {
    expect(() => cyclicLatinSquare(['A', 'B'])).toThrow(/at least 3/);
    expect(counterbalancedOrders(['A', 'B'])).toEqual([
      ['A', 'B'],
      ['B', 'A'],
    ]);
    expect(() => counterbalancedOrders(['A', 'B', 'C'])).toThrow(/exactly two/);
  });
});
