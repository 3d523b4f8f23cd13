declare module "jstat" {
  interface Distribution {
    pdf(x: number, ...params: number[]): number;
    cdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
  }
  const jStat: {
    normal: Distribution;
    chisquare: Distribution;
    studentt: Distribution;
    beta: Distribution;
    gamma: Distribution;
    binomial: { pdf(k: number, n: number, p: number): number; cdf(k: number, n: number, p: number): number };
    hypgeom: { pdf(k: number, N: number, m: number, n: number): number; cdf(k: number, N: number, m: number, n: number): number };
    gammaln(x: number): number;
    betaln(a: number, b: number): number;
    lowRegGamma(a: number, x: number): number;
    ibeta(x: number, a: number, b: number): number;
    erf(x: number): number;
    erfc(x: number): number;
    [key: string]: unknown;
  };
  export default jStat;
}
