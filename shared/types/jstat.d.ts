// jstat 1.9.6 ships no types; this declares only the parts Mantissa uses.
declare module 'jstat' {
  interface ContinuousDistribution {
    pdf(x: number, ...parameters: number[]): number
    cdf(x: number, ...parameters: number[]): number
    inv(p: number, ...parameters: number[]): number
  }

  interface DiscreteDistribution {
    pdf(k: number, ...parameters: number[]): number
    cdf(k: number, ...parameters: number[]): number
  }

  interface JStat {
    chisquare: ContinuousDistribution
    normal: ContinuousDistribution
    binomial: DiscreteDistribution
    poisson: DiscreteDistribution
    /** Regularized incomplete beta function I_x(a, b). */
    ibeta(x: number, a: number, b: number): number
    /** Lower regularized incomplete gamma function P(a, x). */
    lowRegGamma(a: number, x: number): number
    gammaln(x: number): number
  }

  const jStat: JStat
  export default jStat
}
