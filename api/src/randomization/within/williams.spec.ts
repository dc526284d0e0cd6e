import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isLatinSquare } from './latin-square';
import { carryoverBalance, williamsDesign } from './williams';

const rows = (text: string) => text.split(' / ').map((row) => row.split(' '));
const idsArb = (min: number, max: number) =>
  fc.uniqueArray(fc.string({ minLength: 1, maxLength: 6 }), { minLength: min, maxLength: max });

describe('Williams design', () => {
  it('for 4 conditions equals the standard construction A B D C / B C A D / C D B A / D A C B', () => {
    // Outside check: Williams (1949), columns of the cyclic square reordered 1, 2, n, 3, n−1, … (from memory).
    expect(williamsDesign(['A', 'B', 'C', 'D'])).toEqual(rows('A B D C / B C A D / C D B A / D A C B'));
  });

  it('accepts the form printed in Jones & Kenward and rejects the often-shown square that is not carryover balanced', () => {
    // Outside check: Jones & Kenward, Design and Analysis of Cross-over Trials, Williams square for 4 (from memory).
    const jonesKenward = carryoverBalance(rows('A B C D / B D A C / C A D B / D C B A'));
    expect(jonesKenward.balanced).toBe(true);
    expect(jonesKenward.timesEachPairAdjacent).toBe(1);
    // A Latin square often shown as "balanced", yet A→B, B→A, C→D and D→C occur twice and A→C, C→A, B→D, D→B never.
    const oftenShown = carryoverBalance(rows('A B C D / B A D C / C D A B / D C B A'));
    expect(oftenShown.balanced).toBe(false);
    expect(oftenShown.pairCounts['A>B']).toBe(2);
    expect(oftenShown.pairCounts['A>C']).toBe(0);
    expect(oftenShown.timesEachPairAdjacent).toBeNull();
    expect(isLatinSquare(rows('A B C D / B A D C / C D A B / D C B A'))).toBe(true);
  });

  it('for even n puts every ordered pair of distinct conditions next to each other exactly once, in one Latin square', () => {
    fc.assert(
      fc.property(
        idsArb(4, 14).filter((ids) => ids.length % 2 === 0),
        (ids) => {
          const design = williamsDesign(ids);
          expect(design).toHaveLength(ids.length);
          expect(isLatinSquare(design)).toBe(true);
          const balance = carryoverBalance(design);
          expect(balance.balanced).toBe(true);
          expect(balance.timesEachPairAdjacent).toBe(1);
          expect(Object.keys(balance.pairCounts)).toHaveLength(ids.length * (ids.length - 1));
        },
      ),
    );
  });

  it('for odd n uses 2n orders (square and mirror) with every ordered pair adjacent exactly twice', () => {
    fc.assert(
      fc.property(
        idsArb(3, 13).filter((ids) => ids.length % 2 === 1),
        (ids) => {
          const n = ids.length;
          const design = williamsDesign(ids);
          expect(design).toHaveLength(2 * n);
          expect(isLatinSquare(design.slice(0, n))).toBe(true);
          expect(design.slice(n)).toEqual(design.slice(0, n).map((order) => order.slice().reverse()));
          const balance = carryoverBalance(design);
          expect(balance.balanced).toBe(true);
          expect(balance.timesEachPairAdjacent).toBe(2);
          const timesAtPosition = ids.map((id) =>
            ids.map((_, position) => design.filter((order) => order[position] === id).length),
          );
          expect(timesAtPosition.flat().every((times) => times === 2)).toBe(true);
        },
      ),
    );
  });

  it('refuses fewer than three conditions or a repeated one', () => {
    expect(() => williamsDesign(['A', 'B'])).toThrow(/conditionIds: a Williams design needs at least 3 conditions/);
    expect(() => williamsDesign(['A', 'B', 'A'])).toThrow(/twice/);
  });
});
