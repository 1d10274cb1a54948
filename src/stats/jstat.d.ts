/**
 * Minimal types for the parts of jstat (https://jstat.github.io/, MIT) that src/stats uses.
 * jstat ships no types of its own; its CommonJS entry sets `module.exports` to the jStat object.
 */
declare module 'jstat' {
  interface JStatStudentT {
    /** P(T <= x) for Student's t with `dof` degrees of freedom. */
    cdf(x: number, dof: number): number;
    /** The p-quantile of Student's t with `dof` degrees of freedom. */
    inv(p: number, dof: number): number;
  }
  interface JStatNormal {
    /** P(X <= x) for the normal distribution with the given mean and standard deviation. */
    cdf(x: number, mean: number, sd: number): number;
    /** The p-quantile of the normal distribution with the given mean and standard deviation. */
    inv(p: number, mean: number, sd: number): number;
  }
  interface JStatNoncentralT {
    /** P(T <= x) for the noncentral t with `dof` degrees of freedom and noncentrality `ncp`. */
    cdf(x: number, dof: number, ncp: number): number;
  }
  interface JStatChiSquare {
    /** P(X <= x) for the chi-square distribution with `dof` degrees of freedom. */
    cdf(x: number, dof: number): number;
  }
  interface JStat {
    readonly studentt: JStatStudentT;
    readonly normal: JStatNormal;
    readonly noncentralt: JStatNoncentralT;
    readonly chisquare: JStatChiSquare;
    /** Pearson's correlation coefficient of two equally long arrays. */
    corrcoeff(a: readonly number[], b: readonly number[]): number;
  }
  const jStat: JStat;
  export = jStat;
}
