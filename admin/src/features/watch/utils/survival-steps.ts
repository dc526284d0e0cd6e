// Turns Kaplan–Meier points into step-chart series. Pure: no framework imports.

export interface KaplanMeierPoint {
  time: number;
  survival: number;
  lower: number | null;
  upper: number | null;
  atRisk: number;
  events: number;
}

export interface StepPoint {
  time: number;
  survival: number;
  lower: number | null;
  upper: number | null;
  atRisk: number | null;
  events: number;
}

/**
 * The curve as drawn: 1 at day 0 (the api's points say survival is 1 before the first one), then the value after each time.
 * A drop on day 0 itself keeps both the 1 and the lower value at time 0, so the step shows.
 */
export function toStepPoints(points: readonly KaplanMeierPoint[]): StepPoint[] {
  for (const [index, point] of points.entries()) {
    if (point.survival < 0 || point.survival > 1)
      throw new RangeError(`points[${index}].survival must be between 0 and 1, got ${point.survival}`);
    if (index > 0 && point.time < points[index - 1]!.time)
      throw new RangeError(`points[${index}].time goes back in time (${point.time})`);
  }
  const start: StepPoint = { time: 0, survival: 1, lower: 1, upper: 1, atRisk: points[0]?.atRisk ?? null, events: 0 };
  const rest = points.filter(
    (point, index) => !(index === 0 && point.time === 0 && point.events === 0 && point.survival === 1),
  );
  return [start, ...rest.map((point) => ({ ...point }))];
}

/** Share still in the study at a given day, reading the step curve (value after the last time not later than `day`). */
export function survivalAt(steps: readonly StepPoint[], day: number): number {
  let value = 1;
  for (const step of steps) {
    if (step.time > day) break;
    value = step.survival;
  }
  return value;
}
