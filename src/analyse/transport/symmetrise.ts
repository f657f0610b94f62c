/**
 * Field (anti)symmetrisation of magnetoresistance.
 *
 * ρxx(B) ← [ρxx(B) + ρxx(−B)]/2 and Rxy(B) ← [Rxy(B) − Rxy(−B)]/2 remove the
 * admixture of Hall voltage into Rxx (and of Rxx into Rxy) caused by
 * misaligned contacts. The basis is Onsager–Casimir reciprocity,
 * R_mn,kl(B) = R_kl,mn(−B) (Büttiker, Phys. Rev. Lett. 57, 1761 (1986)).
 *
 * Both branches are interpolated linearly onto the |B| values of the positive
 * branch that lie inside the range both signs cover (plus B = 0 when measured).
 * A sweep with one field sign only is returned unsymmetrised with
 * `symmetrised: false` (the validator has already warned).
 */
import { interpolateLinear, sortByX } from "../numeric/interpolate.ts";

export interface SymmetrisedTrace {
  /** |B| grid, T, ascending. */
  b: Float64Array;
  /** Even part (parity "even") or odd part (parity "odd") at each |B|. */
  y: Float64Array;
  symmetrised: boolean;
}

export function symmetriseField(B: ArrayLike<number>, y: ArrayLike<number>, parity: "even" | "odd"): SymmetrisedTrace {
  const posB: number[] = [];
  const posY: number[] = [];
  const negB: number[] = [];
  const negY: number[] = [];
  for (let i = 0; i < B.length; i++) {
    if (B[i] >= 0) {
      posB.push(B[i]);
      posY.push(y[i]);
    }
    if (B[i] <= 0) {
      negB.push(-B[i]);
      negY.push(y[i]);
    }
  }
  const pos = sortByX(posB, posY);
  const neg = sortByX(negB, negY);
  const posCount = posB.filter((b) => b > 0).length;
  const negCount = negB.filter((b) => b > 0).length;
  if (posCount < 2 || negCount < 2) {
    const one = posCount >= negCount ? pos : neg;
    const sign = posCount >= negCount || parity === "even" ? 1 : -1;
    return { b: one.x, y: one.y.map((v) => sign * v), symmetrised: false };
  }
  const top = Math.min(pos.x[pos.x.length - 1], neg.x[neg.x.length - 1]);
  const bottom = Math.max(pos.x[0], neg.x[0]);
  const grid: number[] = [];
  const out: number[] = [];
  for (let i = 0; i < pos.x.length; i++) {
    const b = pos.x[i];
    if (b < bottom || b > top) continue;
    const yn = interpolateLinear(neg.x, neg.y, b);
    const yp = pos.y[i];
    grid.push(b);
    out.push(parity === "even" ? (yp + yn) / 2 : (yp - yn) / 2);
  }
  return { b: Float64Array.from(grid), y: Float64Array.from(out), symmetrised: true };
}
