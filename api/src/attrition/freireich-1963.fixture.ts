import { tallySurvivalTimes } from './kaplan-meier';

// Source: Freireich et al. (1963), Blood 21:699, remission times in weeks of the 6-MP and placebo groups ("+" censored),
// as printed in most survival texts and in R's MASS::gehan (checked against the Rdatasets copy via the search tool).
export const sixMp = tallySurvivalTimes(
  [
    [6, true],
    [6, true],
    [6, true],
    [6, false],
    [7, true],
    [9, false],
    [10, true],
    [10, false],
    [11, false],
    [13, true],
    [16, true],
    [17, false],
    [19, false],
    [20, false],
    [22, true],
    [23, true],
    [25, false],
    [32, false],
    [32, false],
    [34, false],
    [35, false],
  ].map(([time, dropped]) => ({ time: time as number, dropped: dropped as boolean })),
);
export const placebo = tallySurvivalTimes(
  [1, 1, 2, 2, 3, 4, 4, 5, 5, 8, 8, 8, 8, 11, 11, 12, 12, 15, 17, 22, 23].map((time) => ({ time, dropped: true })),
);
