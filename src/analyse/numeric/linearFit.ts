/**
 * Ordinary least-squares straight line y = slope·x + intercept.
 *
 * Method: closed-form normal equations on centred data (common practice; see e.g.
 * Press et al., Numerical Recipes, 3rd ed., §15.2), with standard errors from the
 * residual variance s² = Σr²/(n−2). R² = 1 − SS_res/SS_tot.
 *
 * Throws RangeError when fewer than two points or when all x are equal.
 * Example: linearFit([0,1,2],[1,3,5]) → { slope: 2, intercept: 1, r2: 1, … }
 */
export interface LinearFit {
  slope: number;
  intercept: number;
  slopeStdErr: number;
  interceptStdErr: number;
  r2: number;
  n: number;
}

export function linearFit(x: ArrayLike<number>, y: ArrayLike<number>): LinearFit {
  const n = x.length;
  if (n !== y.length) throw new RangeError(`linearFit: x has ${n} values, y has ${y.length}`);
  if (n < 2) throw new RangeError(`linearFit: need at least 2 points, got ${n}`);
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx;
    const dy = y[i] - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (sxx === 0) throw new RangeError("linearFit: all x values are equal");
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  const ssRes = Math.max(0, syy - slope * sxy);
  const r2 = syy === 0 ? 1 : 1 - ssRes / syy;
  const s2 = n > 2 ? ssRes / (n - 2) : 0;
  const slopeStdErr = Math.sqrt(s2 / sxx);
  const interceptStdErr = Math.sqrt(s2 * (1 / n + (mx * mx) / sxx));
  return { slope, intercept, slopeStdErr, interceptStdErr, r2, n };
}
