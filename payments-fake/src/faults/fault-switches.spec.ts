import { describe, expect, it } from 'vitest';
import { ControlInputError } from '../control/control-input';
import { FaultSwitches, readFaultChange } from './fault-switches';

describe('FaultSwitches', () => {
  it('counts down failNext and then stops failing', () => {
    const faults = new FaultSwitches();
    faults.apply(readFaultChange({ failNext: { status: 429, count: 2 } }));
    expect(faults.takeRequestFault()).toEqual({ kind: 'fail', status: 429 });
    expect(faults.takeRequestFault()).toEqual({ kind: 'fail', status: 429 });
    expect(faults.takeRequestFault()).toBeUndefined();
    expect(faults.settings().failNext).toBeNull();
  });

  it('drops connections before failing, each switch counting on its own', () => {
    const faults = new FaultSwitches();
    faults.apply(readFaultChange({ dropConnectionNext: 1, failNext: { status: 500, count: 1 }, dropResponseNext: 1 }));
    expect(faults.takeRequestFault()).toEqual({ kind: 'drop_connection' });
    expect(faults.takeRequestFault()).toEqual({ kind: 'fail', status: 500 });
    expect(faults.takeRequestFault()).toBeUndefined();
    expect(faults.takeResponseDrop()).toBe(true);
    expect(faults.takeResponseDrop()).toBe(false);
  });

  it('merges changes and clears everything', () => {
    const faults = new FaultSwitches();
    faults.apply(readFaultChange({ latencyMs: 50, webhook: { duplicate: true } }));
    faults.apply(readFaultChange({ webhook: { delayMs: 10 } }));
    expect(faults.settings()).toMatchObject({
      latencyMs: 50,
      webhook: { duplicate: true, delayMs: 10, reorder: false },
    });
    faults.clear();
    expect(faults.settings()).toEqual({
      latencyMs: 0,
      failNext: null,
      dropConnectionNext: 0,
      dropResponseNext: 0,
      webhook: { duplicate: false, delayMs: 0, reorder: false },
    });
  });
});

describe('readFaultChange', () => {
  it('names the field that is wrong', () => {
    const cases: Array<[unknown, string]> = [
      [{ latencyMs: -1 }, 'latencyMs'],
      [{ latencyMs: 'slow' }, 'latencyMs'],
      [{ failNext: { status: 503 } }, 'failNext.status'],
      [{ failNext: { status: 500, count: 1.5 } }, 'failNext.count'],
      [{ failNext: { status: 500, times: 2 } }, 'failNext.times'],
      [{ webhook: { duplicate: 'yes' } }, 'webhook.duplicate'],
      [{ webhook: { shuffle: true } }, 'webhook.shuffle'],
      [{ dropConnectionNext: 1, typo: 1 }, 'typo'],
      [[1, 2], 'body'],
    ];
    for (const [input, field] of cases) {
      try {
        readFaultChange(input);
        throw new Error(`accepted ${JSON.stringify(input)}`);
      } catch (error) {
        expect(error).toBeInstanceOf(ControlInputError);
        expect((error as ControlInputError).field).toBe(field);
      }
    }
  });

  it('defaults failNext.count to 1', () => {
    expect(readFaultChange({ failNext: { status: 500 } })).toEqual({ failNext: { status: 500, count: 1 } });
  });
});
