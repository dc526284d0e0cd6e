import { describe, expect, it } from 'vitest';
import { splitFollowedGroups, type FollowedGroupRow } from './followed-groups';

const group = (overrides: Partial<FollowedGroupRow>): FollowedGroupRow => ({
  arm: 'arm-a',
  status: 'active',
  assigned: true,
  reason: null,
  randomized: true,
  day: 0,
  n: 1,
  ...overrides,
});

describe('splitFollowedGroups', () => {
  it('sums the flow boxes over days and counts dropouts and censorings per arm and day', () => {
    const { flow, survival } = splitFollowedGroups([
      group({ status: 'withdrew', reason: 'no time', day: 3, n: 2 }),
      group({ status: 'withdrew', reason: 'no time', day: 5, n: 1 }),
      group({ status: 'completed', day: 5, n: 4 }),
      group({ status: 'lost', reason: 'no reply', day: 5, n: 1 }),
      group({ arm: 'arm-b', status: 'excluded', reason: 'moved away', day: 2, n: 1 }),
      // Screened out before assignment: a flow box, but no time at risk.
      group({ arm: null, status: 'excluded', assigned: false, reason: 'under 18', randomized: false, day: null, n: 6 }),
    ]);

    expect(flow).toEqual([
      { arm: 'arm-a', status: 'withdrew', assigned: true, reason: 'no time', n: 3 },
      { arm: 'arm-a', status: 'completed', assigned: true, reason: null, n: 4 },
      { arm: 'arm-a', status: 'lost', assigned: true, reason: 'no reply', n: 1 },
      { arm: 'arm-b', status: 'excluded', assigned: true, reason: 'moved away', n: 1 },
      { arm: null, status: 'excluded', assigned: false, reason: 'under 18', n: 6 },
    ]);
    expect(survival).toEqual([
      { arm: 'arm-a', day: 3, dropped: 2, censored: 0 },
      { arm: 'arm-a', day: 5, dropped: 2, censored: 4 },
      { arm: 'arm-b', day: 2, dropped: 1, censored: 0 },
    ]);
  });

  it('keeps every enrollment: the flow total and the randomized total match the input', () => {
    const rows = [
      group({ status: 'active', day: 1, n: 7 }),
      group({ status: 'assigned', day: 0, n: 3 }),
      group({ arm: null, status: 'screening', assigned: false, randomized: false, day: null, n: 5 }),
    ];
    const { flow, survival } = splitFollowedGroups(rows);
    expect(flow.reduce((total, box) => total + box.n, 0)).toBe(15);
    expect(survival.reduce((total, time) => total + time.dropped + time.censored, 0)).toBe(10);
  });

  it('splits the same follow-up by stratum, under the same counting rule', () => {
    const { strata, survival } = splitFollowedGroups(
      [
        group({ status: 'withdrew', day: 3, stratum: 'age=<30', n: 2 }),
        group({ status: 'active', day: 3, stratum: 'age=≥30', n: 1 }),
        group({ status: 'completed', day: 3, stratum: null, n: 4 }),
      ],
      true,
    );
    expect(strata).toEqual([
      { stratum: 'age=<30', arm: 'arm-a', day: 3, dropped: 2, censored: 0 },
      { stratum: 'age=≥30', arm: 'arm-a', day: 3, dropped: 1, censored: 0 },
      { stratum: null, arm: 'arm-a', day: 3, dropped: 0, censored: 4 },
    ]);
    expect(survival).toEqual([{ arm: 'arm-a', day: 3, dropped: 3, censored: 4 }]);
  });

  it('refuses a randomized group with no day rather than dropping it from the curves', () => {
    expect(() => splitFollowedGroups([group({ day: null })])).toThrow('A randomized group has no day.');
  });
});
