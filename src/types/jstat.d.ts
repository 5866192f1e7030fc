// Minimal typing for the parts of jstat (a JavaScript statistics library with no bundled types) that we use.
declare module 'jstat' {
  interface Continuous1 { cdf(x: number, a: number): number; inv(p: number, a: number): number }
  interface Continuous2 { cdf(x: number, a: number, b: number): number; inv(p: number, a: number, b: number): number }
  export const jStat: {
    studentt: Continuous1;
    chisquare: Continuous1;
    centralF: Continuous2;
    beta: Continuous2;
    normal: { cdf(x: number, mean: number, sd: number): number; inv(p: number, mean: number, sd: number): number };
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
    gammap(a: number, x: number): number;
  };
}
