// Minimal declarations for the parts of jstat 1.9.6 this folder uses (the package ships no types).
declare module 'jstat' {
  interface JStatStatic {
    chisquare: { cdf(x: number, dof: number): number };
    normal: { inv(p: number, mean: number, sd: number): number; cdf(x: number, mean: number, sd: number): number };
    studentt: { inv(p: number, dof: number): number; cdf(x: number, dof: number): number };
    ibeta(x: number, a: number, b: number): number;
    combinationln(n: number, k: number): number;
    combination(n: number, k: number): number;
    centralF: { cdf(x: number, df1: number, df2: number): number; inv(p: number, df1: number, df2: number): number };
    mean(values: number[]): number;
    variance(values: number[], sample?: boolean): number;
  }
  export const jStat: JStatStatic;
}
