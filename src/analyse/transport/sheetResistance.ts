/**
 * Zero-field sheet resistance from a symmetrised ρ-like trace.
 *
 * When B = 0 (|B| < 1 mT) was measured, that value is used. Otherwise the
 * lowest points are extrapolated to B = 0 with a straight line in B² over the
 * five lowest fields (the classical magnetoresistance is even in B and
 * quadratic to lowest order; common practice).
 * Hall bar: ρ_xx = R_xx·W/L, L the centre-to-centre voltage-probe spacing.
 */
import { linearFit } from "../numeric/linearFit.ts";

export function zeroFieldValue(b: ArrayLike<number>, y: ArrayLike<number>): number {
  if (b.length === 0) return NaN;
  if (Math.abs(b[0]) < 1e-3) return y[0];
  const k = Math.min(5, b.length);
  if (k < 2) return y[0];
  const b2: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < k; i++) {
    b2.push(b[i] * b[i]);
    ys.push(y[i]);
  }
  return linearFit(b2, ys).intercept;
}

/** Hall-bar sheet resistance ρ = R·W/L, Ω per square. */
export function hallBarSheetResistance(rxx: number, widthUm: number, lengthUm: number): number {
  return (rxx * widthUm) / lengthUm;
}
