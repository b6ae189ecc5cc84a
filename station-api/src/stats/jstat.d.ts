// Minimal typings for the parts of jStat (npm "jstat", a devDependency) the stats specs use as a reference.
declare module 'jstat' {
  interface Dist2 {
    cdf(x: number, a: number, b: number): number;
    inv(p: number, a: number, b: number): number;
    pdf(x: number, a: number, b: number): number;
  }
  interface Dist1 {
    cdf(x: number, a: number): number;
    inv(p: number, a: number): number;
  }
  export const jStat: {
    normal: Dist2;
    chisquare: Dist1;
    gammaln(x: number): number;
    erfc(x: number): number;
    mean(xs: number[]): number;
    stdev(xs: number[], sample?: boolean): number;
    percentile(xs: number[], k: number, exclusive?: boolean): number;
    quartiles(xs: number[]): number[];
  };
}
