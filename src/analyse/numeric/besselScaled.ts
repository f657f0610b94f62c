/**
 * Exponentially scaled modified Bessel functions of the first kind,
 * e^(−y)·I0(y) and e^(−y)·I1(y) for y ≥ 0, as the Rician distribution needs
 * them (the scaling keeps them finite for large arguments).
 *
 * Method (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964):
 *  - y ≤ 25: the ascending series I_n(y) = Σ_k (y/2)^(2k+n) / (k!·(k+n)!)
 *    (A&S 9.6.10), summed until a term no longer changes the sum; all terms
 *    are positive, so there is no cancellation;
 *  - y > 25: the asymptotic expansion
 *    e^(−y)·I_n(y) ≈ (2πy)^(−1/2)·Σ_k (−1)^k·a_k(n)/y^k with
 *    a_k(n) = Π_{j=1..k} (4n² − (2j−1)²) / (k!·8^k) (A&S 9.7.1), truncated at
 *    its smallest term (well below 1e-15 relative for y > 25).
 * Throws RangeError for a negative or non-finite y.
 */

const SWITCH = 25;

function check(y: number): void {
  if (!(y >= 0) || !Number.isFinite(y)) throw new RangeError(`besselScaled: the argument must be finite and ≥ 0, got ${y}`);
}

function series(n: 0 | 1, y: number): number {
  const h = y / 2;
  let term = n === 0 ? 1 : h;
  let sum = term;
  for (let k = 1; k < 500; k++) {
    term *= (h * h) / (k * (k + n));
    const next = sum + term;
    if (next === sum) break;
    sum = next;
  }
  return sum * Math.exp(-y);
}

function asymptotic(n: 0 | 1, y: number): number {
  const mu = 4 * n * n;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 30; k++) {
    const next = (-term * (mu - (2 * k - 1) ** 2)) / (k * 8 * y);
    if (Math.abs(next) >= Math.abs(term)) break;
    term = next;
    sum += term;
    if (Math.abs(term) < 1e-17 * Math.abs(sum)) break;
  }
  return sum / Math.sqrt(2 * Math.PI * y);
}

/** e^(−y)·I0(y), y ≥ 0. */
export function besselI0Scaled(y: number): number {
  check(y);
  return y <= SWITCH ? series(0, y) : asymptotic(0, y);
}

/** e^(−y)·I1(y), y ≥ 0. */
export function besselI1Scaled(y: number): number {
  check(y);
  return y <= SWITCH ? series(1, y) : asymptotic(1, y);
}
