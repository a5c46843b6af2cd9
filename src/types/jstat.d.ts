/**
 * The part of jStat 1.9 that headroom uses (the package ships no types). jStat is a UMD bundle whose
 * CommonJS export is the `jStat` object; Node's ESM loader presents it as the default export.
 */
declare module "jstat" {
  interface JStatDistribution {
    /** Density at x. */
    pdf(x: number, ...parameters: number[]): number;
    /** Cumulative probability at x. */
    cdf(x: number, ...parameters: number[]): number;
    /** Quantile: the x with cdf(x) = p. */
    inv(p: number, ...parameters: number[]): number;
  }
  interface JStat {
    /** Beta(alpha, beta): pdf(x, alpha, beta), cdf(x, alpha, beta), inv(p, alpha, beta). */
    beta: JStatDistribution;
    /** Normal(mean, sd): pdf(x, mean, sd), cdf(x, mean, sd), inv(p, mean, sd). */
    normal: JStatDistribution;
  }
  const jStat: JStat;
  export default jStat;
}
