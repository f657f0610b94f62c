/**
 * Critical thickness of a strained layer on a thick substrate.
 *
 * Matthews–Blakeslee force balance for a single layer with 60° misfit
 * dislocations (the 8π single-layer form, REFERENCES §5):
 *   h_c = b(1 − ν cos²α) / [8π |ε| (1+ν) cos λ] · [ln(h_c/b) + 1],
 * b = a/√2, cos α = cos λ = 1/2. Matthews & Blakeslee, J. Cryst. Growth 27, 118
 * (1974) print 2πf for their multilayers (each layer strained f/2, two
 * interfaces); used on a single layer that form is about 5× too large.
 * People–Bean energy balance: h_c = [(1−ν)/(1+ν)]·[1/(16π√2)]·(b²/a)·(1/ε²)·ln(h_c/b),
 * b ≈ 4 Å (People & Bean, Appl. Phys. Lett. 47, 322 (1985)).
 * Both implicit equations h = A·g(h) are solved by fixed-point iteration from a
 * large start, which converges to the physical (larger) root.
 * Lengths in m; ε is the layer's misfit strain (dimensionless, sign ignored).
 */

export type CriticalThickness =
  | { ok: true /** m */; thickness: number; iterations: number; model: "matthews-blakeslee" | "people-bean" }
  | { ok: false; reason: string };

/** People & Bean's Burgers vector, m (≈ 4 Å, People & Bean 1985). */
export const PEOPLE_BEAN_BURGERS = 4e-10;

function fixedPoint(prefactor: number, b: number, offset: number): { h: number; it: number } | string {
  // Solve h = A·[ln(h/b) + offset]. A root above b exists when A·(ln(A/b) + offset − 1) ≥ 0 at h = A.
  let h = Math.max(prefactor, b) * 100;
  for (let it = 1; it <= 500; it++) {
    const next = prefactor * (Math.log(h / b) + offset);
    if (!(next > b)) return "the strain is so large that the critical thickness is below one Burgers vector";
    if (Math.abs(next - h) < 1e-12 * h) return { h: next, it };
    h = next;
  }
  return "the critical-thickness iteration did not converge";
}

function checkInputs(strain: number, a: number, nu: number): string | undefined {
  if (![strain, a, nu].every(Number.isFinite)) return "strain, lattice constant and Poisson ratio must be finite numbers";
  if (strain === 0) return "the layer has no misfit, so there is no critical thickness";
  if (!(a > 0)) return "the lattice constant must be positive";
  if (!(nu > -1 && nu < 0.5)) return "the Poisson ratio must lie between −1 and 0.5";
  return undefined;
}

/**
 * Matthews–Blakeslee critical thickness (m) of a single layer with misfit strain
 * `strain`, lattice constant `a` (m, gives b = a/√2) and Poisson ratio ν
 * (C12/(C11+C12)), 60° dislocations. Checks: Si on Si0.7Ge0.3 7.8 nm, Si0.8Ge0.2
 * on Si 13.6 nm, Ge on Si 1.15 nm (REFERENCES §5, derived).
 */
export function matthewsBlakeslee(strain: number, a: number, nu: number): CriticalThickness {
  const bad = checkInputs(strain, a, nu);
  if (bad) return { ok: false, reason: bad };
  const b = a / Math.SQRT2;
  const cosAlpha = 0.5;
  const cosLambda = 0.5;
  const A = (b * (1 - nu * cosAlpha * cosAlpha)) / (8 * Math.PI * Math.abs(strain) * (1 + nu) * cosLambda);
  const r = fixedPoint(A, b, 1);
  return typeof r === "string" ? { ok: false, reason: r } : { ok: true, thickness: r.h, iterations: r.it, model: "matthews-blakeslee" };
}

/**
 * People–Bean critical thickness (m) for misfit `strain`, layer lattice constant
 * `a` (m), Poisson ratio ν and Burgers vector b (default 4 Å). Checks:
 * Si0.7Ge0.3 on Si 96 nm, Si on Si0.7Ge0.3 98 nm with ν = 0.28 (REFERENCES §5, derived).
 */
export function peopleBean(strain: number, a: number, nu: number, b = PEOPLE_BEAN_BURGERS): CriticalThickness {
  const bad = checkInputs(strain, a, nu) ?? (b > 0 && Number.isFinite(b) ? undefined : "the Burgers vector must be positive");
  if (bad) return { ok: false, reason: bad };
  const A = (((1 - nu) / (1 + nu)) * (1 / (16 * Math.PI * Math.SQRT2)) * ((b * b) / a)) / (strain * strain);
  const r = fixedPoint(A, b, 0);
  return typeof r === "string" ? { ok: false, reason: r } : { ok: true, thickness: r.h, iterations: r.it, model: "people-bean" };
}

export interface ThicknessComparison {
  /** True when the layer is thicker than its critical thickness. */
  beyond: boolean;
  /** h_c − thickness, m (negative when beyond). */
  margin: number;
  /** thickness / h_c. */
  ratio: number;
}

/** Compares a layer thickness (m) with a critical thickness (m). Throws RangeError for non-positive or non-finite inputs (a programming error: check `ok` first). */
export function compareWithCritical(thickness: number, critical: number): ThicknessComparison {
  if (!(thickness > 0 && critical > 0 && Number.isFinite(thickness) && Number.isFinite(critical))) {
    throw new RangeError("compareWithCritical: thicknesses must be positive finite numbers");
  }
  return { beyond: thickness > critical, margin: critical - thickness, ratio: thickness / critical };
}
