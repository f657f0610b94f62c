/**
 * van der Pauw sheet resistance.
 *
 * Solves exp(−π·R_A/R_s) + exp(−π·R_B/R_s) = 1 for R_s by Newton's method on
 * u = 1/R_s (van der Pauw, Philips Res. Rep. 13, 1 (1958); the iteration as on
 * NIST's "Hall Effect Measurements – Algorithm" page). Symmetric case:
 * R_s = π·R/ln 2. Throws RangeError for non-positive resistances (the caller
 * reports them as data problems first).
 */
export function vanDerPauwSheetResistance(ra: number, rb: number): number {
  if (!(ra > 0 && rb > 0) || !Number.isFinite(ra) || !Number.isFinite(rb)) {
    throw new RangeError(`vanDerPauwSheetResistance: resistances must be positive and finite, got ${ra}, ${rb}`);
  }
  // f(u) = e^{−πR_A u} + e^{−πR_B u} − 1, decreasing and convex in u > 0.
  let u = (2 * Math.LN2) / (Math.PI * (ra + rb));
  for (let i = 0; i < 100; i++) {
    const ea = Math.exp(-Math.PI * ra * u);
    const eb = Math.exp(-Math.PI * rb * u);
    const f = ea + eb - 1;
    const df = -Math.PI * (ra * ea + rb * eb);
    const next = u - f / df;
    if (Math.abs(next - u) <= 1e-15 * u) {
      u = next;
      break;
    }
    u = next > 0 ? next : u / 2;
  }
  return 1 / u;
}
