// The part of jStat (npm `jstat`, which ships no types) the tests use as a reference.
declare module 'jstat' {
  interface NormalDistribution {
    /** Quantile function: the x with P(X ≤ x) = p. */
    inv(p: number, mean: number, std: number): number;
    cdf(x: number, mean: number, std: number): number;
  }
  const jStat: { normal: NormalDistribution };
  export default jStat;
}
