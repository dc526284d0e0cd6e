import { jStat } from 'jstat';
import { requireAtMost, requireCount } from './attrition-input-error';

export interface Interval {
  lower: number;
  upper: number;
}

function zFor(confidenceLevel: number): number {
  return jStat.normal.inv(1 - (1 - confidenceLevel) / 2, 0, 1);
}

// Wilson score interval for one proportion (Wilson 1927; method 3 of Newcombe 1998, Statistics in Medicine 17:857):
// (p + z²/2n ± z√(p(1 − p)/n + z²/4n²)) / (1 + z²/n). Null when n is 0.
export function wilsonInterval(events: number, n: number, confidenceLevel = 0.95, field = 'count'): Interval | null {
  requireCount(events, `${field}.events`);
  requireCount(n, `${field}.n`);
  requireAtMost(events, n, `${field}.events`, 'n');
  if (n === 0) return null;
  const z = zFor(confidenceLevel);
  const p = events / n;
  const centre = p + (z * z) / (2 * n);
  const spread = z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  const scale = 1 + (z * z) / n;
  return { lower: Math.max(0, (centre - spread) / scale), upper: Math.min(1, (centre + spread) / scale) };
}

// Newcombe's hybrid score interval for p1 − p2 (Newcombe 1998, Statistics in Medicine 17:873, method 10), from the
// two Wilson intervals: δ − √((p1 − l1)² + (u2 − p2)²) to δ + √((u1 − p1)² + (p2 − l2)²).
export function newcombeDifferenceInterval(
  events1: number,
  n1: number,
  events2: number,
  n2: number,
  confidenceLevel = 0.95,
): Interval | null {
  const one = wilsonInterval(events1, n1, confidenceLevel, 'first');
  const two = wilsonInterval(events2, n2, confidenceLevel, 'second');
  if (one === null || two === null) return null;
  const p1 = events1 / n1;
  const p2 = events2 / n2;
  const difference = p1 - p2;
  return {
    lower: difference - Math.sqrt((p1 - one.lower) ** 2 + (two.upper - p2) ** 2),
    upper: difference + Math.sqrt((one.upper - p1) ** 2 + (p2 - two.lower) ** 2),
  };
}

export interface RiskRatio {
  estimate: number;
  lower: number;
  upper: number;
}

// Risk ratio (p1 / p2) with the Katz log interval (Katz et al. 1978, Biometrics 34:469): SE(log RR) = √(1/a − 1/n1 + 1/b − 1/n2).
// Null when either group has no events or nobody (the ratio or its interval is undefined).
export function riskRatio(
  events1: number,
  n1: number,
  events2: number,
  n2: number,
  confidenceLevel = 0.95,
): RiskRatio | null {
  if (n1 === 0 || n2 === 0 || events1 === 0 || events2 === 0) return null;
  const estimate = events1 / n1 / (events2 / n2);
  const standardError = Math.sqrt(1 / events1 - 1 / n1 + 1 / events2 - 1 / n2);
  const z = zFor(confidenceLevel);
  return {
    estimate,
    lower: Math.exp(Math.log(estimate) - z * standardError),
    upper: Math.exp(Math.log(estimate) + z * standardError),
  };
}
