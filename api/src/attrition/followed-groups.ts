/**
 * The study's enrollments as one grouped read serves both the CONSORT boxes and the dropout curves; this splits
 * that read into the two shapes the report takes.
 */

export interface FlowRow {
  arm: string | null;
  status: string;
  assigned: boolean;
  reason: string | null;
  n: number;
}

export interface SurvivalRow {
  arm: string;
  day: number;
  dropped: number;
  censored: number;
}

/** A survival row within one randomization stratum (the enrollment's stratum key; null when none was recorded). */
export interface StratumSurvivalRow extends SurvivalRow {
  stratum: string | null;
}

/** Enrollments counted by arm, status, reason, whether they were randomized and (randomized only) exact days followed. */
export interface FollowedGroupRow extends FlowRow {
  randomized: boolean;
  day: number | null;
  /** The randomization stratum key; absent or null when none was recorded. */
  stratum?: string | null;
}

/** Withdrew, lost to follow-up, or excluded after randomization: the dropout event (CONSORT 2010 follow-up box). */
const DROPPED_STATUSES = new Set(['withdrew', 'lost', 'excluded']);

const STILL_ACTIVE_STATUSES = new Set(['assigned', 'active']);

/**
 * Splits the grouped read. In a closed study people still active did not complete and count as dropping out at the
 * closing time (their follow-up time, which the SQL ends at the close); while it runs they are censored (COUNTING_RULE).
 */
export function splitFollowedGroups(
  rows: readonly FollowedGroupRow[],
  studyClosed = false,
): { flow: FlowRow[]; survival: SurvivalRow[]; strata: StratumSurvivalRow[] } {
  const flow = new Map<string, FlowRow>();
  const survival = new Map<string, SurvivalRow>();
  const strata = new Map<string, StratumSurvivalRow>();
  for (const row of rows) {
    const flowKey = JSON.stringify([row.arm, row.status, row.assigned, row.reason]);
    const box = flow.get(flowKey);
    if (box) box.n += row.n;
    else flow.set(flowKey, { arm: row.arm, status: row.status, assigned: row.assigned, reason: row.reason, n: row.n });

    if (!row.randomized) continue;
    if (row.arm === null || row.day === null)
      throw new Error(`A randomized group has no ${row.arm === null ? 'arm' : 'day'}.`);
    const timeKey = JSON.stringify([row.arm, row.day]);
    const time = survival.get(timeKey) ?? { arm: row.arm, day: row.day, dropped: 0, censored: 0 };
    const stratum = row.stratum ?? null;
    const stratumKey = JSON.stringify([stratum, row.arm, row.day]);
    const inStratum = strata.get(stratumKey) ?? { stratum, arm: row.arm, day: row.day, dropped: 0, censored: 0 };
    // One counting rule for the pooled and the stratified figures alike.
    if (DROPPED_STATUSES.has(row.status) || (studyClosed && STILL_ACTIVE_STATUSES.has(row.status))) {
      time.dropped += row.n;
      inStratum.dropped += row.n;
    } else {
      time.censored += row.n;
      inStratum.censored += row.n;
    }
    survival.set(timeKey, time);
    strata.set(stratumKey, inStratum);
  }
  return { flow: [...flow.values()], survival: [...survival.values()], strata: [...strata.values()] };
}
