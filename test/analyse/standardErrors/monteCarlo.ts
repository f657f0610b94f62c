/**
 * Monte Carlo check of a reported standard error: the estimate is repeated on
 * independent noisy draws from a synthetic generator, and the mean reported
 * standard error is compared with the sample standard deviation of the
 * estimates (common practice; e.g. Press et al., Numerical Recipes, 3rd ed.,
 * §15.6 "confidence limits by Monte Carlo"). With N draws the sample SD itself
 * scatters by about 1/√(2(N − 1)) relative, so the tolerance is set from N.
 */
export interface MonteCarloSpread {
  /** Sample standard deviation of the estimates (n − 1). */
  sd: number;
  /** Mean of the reported standard errors. */
  meanStdErr: number;
  /** meanStdErr / sd. */
  ratio: number;
  /** Mean of the estimates. */
  mean: number;
}

/** Runs `draw(i)` for i = 0…n−1, each returning { value, stdErr }, and summarises the spread. */
export function monteCarloSpread(n: number, draw: (i: number) => { value: number; stdErr: number }): MonteCarloSpread {
  const values: number[] = [];
  const errs: number[] = [];
  for (let i = 0; i < n; i++) {
    const d = draw(i);
    values.push(d.value);
    errs.push(d.stdErr);
  }
  const mean = values.reduce((a, b) => a + b, 0) / n;
  const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1));
  const meanStdErr = errs.reduce((a, b) => a + b, 0) / n;
  return { sd, meanStdErr, ratio: meanStdErr / sd, mean };
}
