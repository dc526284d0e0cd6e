/** bigint columns hold money in minor units; they fit a JS number exactly up to 2^53. */
export const bigintAsNumber = {
  to: (value: number | null | undefined) => value,
  from: (value: string | null) => (value === null ? null : Number(value)),
};
