import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { WithinOrdersParameters } from '../scheme-parameters';
import { designOrders, generateOrderSequence, OrderSlot, orderStratumOf } from './order-sequence';

const seedArb = fc.uint8Array({ minLength: 32, maxLength: 32 }).map((bytes) => Buffer.from(bytes).toString('hex'));
const SEED = '42'.repeat(32);

const williams: WithinOrdersParameters = {
  method: 'williams',
  conditionIds: ['express', 'guest', 'account'],
  squaresPerBlock: [1, 2],
  factors: [{ id: 'device', kind: 'categorical', categories: ['phone', 'desktop'] }],
};

describe('within-subjects order sequence', () => {
  it('hands out whole copies of the design in each complete block', () => {
    fc.assert(
      fc.property(
        seedArb,
        fc.constantFrom<WithinOrdersParameters['method']>('counterbalanced', 'latin-square', 'williams'),
        fc.integer({ min: 3, max: 6 }),
        fc.integer({ min: 0, max: 120 }),
        (seed, method, n, count) => {
          const conditionIds = Array.from({ length: method === 'counterbalanced' ? 2 : n }, (_, i) => `c${i}`);
          const parameters: WithinOrdersParameters = { method, conditionIds, squaresPerBlock: [1, 2], factors: [] };
          const orders = designOrders(parameters);
          const slots = generateOrderSequence(seed, parameters, 'all', count);
          expect(slots).toHaveLength(count);
          const blocks = new Map<number, OrderSlot[]>();
          for (const slot of slots) blocks.set(slot.blockIndex, [...(blocks.get(slot.blockIndex) ?? []), slot]);
          for (const block of blocks.values()) {
            expect([orders.length, 2 * orders.length]).toContain(block[0].blockSize);
            for (const slot of block) expect(slot.order).toEqual(orders[slot.orderIndex]);
            if (block.length < block[0].blockSize) continue;
            const copies = block[0].blockSize / orders.length;
            const perOrder = orders.map((_, i) => block.filter((s) => s.orderIndex === i).length);
            expect(perOrder).toEqual(orders.map(() => copies));
          }
        },
      ),
      { numRuns: 100 },
    );
  });

  it('keeps one reproducible sequence per stratum when stratified', () => {
    expect(orderStratumOf(williams, { device: 'phone' })).toBe('device=phone');
    const phone = generateOrderSequence(SEED, williams, 'device=phone', 24);
    const desktop = generateOrderSequence(SEED, williams, 'device=desktop', 24);
    expect(phone.map((s) => s.orderIndex)).not.toEqual(desktop.map((s) => s.orderIndex));
    expect(generateOrderSequence(SEED, williams, 'device=phone', 24)).toEqual(phone);
    expect(generateOrderSequence(SEED, williams, 'device=phone', 48).slice(0, 24)).toEqual(phone);
    expect(designOrders(williams)).toHaveLength(6);
    expect(() => generateOrderSequence(SEED, williams, 'all', 3)).toThrow(/stratumKey/);
  });
});
