/**
 * An independent Shubnikov–de Haas generator for tests: imports nothing from
 * src/ (constants written out, its own random numbers), so a mistake shared
 * with the analysis cannot cancel out.
 *
 * ρxx(B) = ρ_bg(B)·[1 + Σ_s 4·R_T(sX)·R_D^s·R_S(s)·cos(s·(2π f/|B| − π))]
 *   X = 2π² k_B T m* /(ħ e |B|), R_T(x) = x/sinh x, R_D = exp(−π m* /(e |B| τ_q)),
 *   R_S(s) = cos(s·π·g·m* /(2 m_e)), f = h n/(g_s g_v e)
 * Fundamental (s = 1): REFERENCES §7 and §14 (Coleridge, Stoner & Fletcher,
 * PRB 39, 1120 (1989); Coleridge, PRB 44, 3793 (1991)) [M]. The spin factor
 * and the harmonic s = 2 follow the Lifshitz–Kosevich sum (X → sX,
 * R_D → R_D^s) [M, from memory]. Hall resistivity ρxy = B/(n e) (Drude).
 * A measured contact pair picks up `mixing`·ρxy in ρxx and the sweep covers
 * both field signs, so only symmetrisation removes it.
 */

/** CODATA 2018 (exact SI 2019 values for e, h, k_B; m_e measured) [C]. */
const E = 1.602176634e-19;
const H = 6.62607015e-34;
const HBAR = H / (2 * Math.PI);
const KB = 1.380649e-23;
const ME = 9.1093837015e-31;

export interface LkParams {
  /** Sheet density, m⁻². */
  density: number;
  /** Quantum lifetime, s. */
  tauQ: number;
  /** Temperature, K. */
  temperature: number;
  /** m* /m_e. */
  mass: number;
  /** Zero-field resistivity, Ω. */
  rho0: number;
  /** Linear magnetoresistance: ρ_bg = ρ0·(1 + slope·|B|), slope in 1/T. */
  slope: number;
  /** Electron g factor for the spin factor (0: no spin factor). */
  g: number;
  /** Include the s = 2 harmonic. */
  harmonic: boolean;
}

export function lkFrequency(density: number): number {
  return (H * density) / (4 * E);
}

function thermal(x: number): number {
  return x < 1e-8 ? 1 : x / Math.sinh(x);
}

/** ρxx at one field (T), Ω. */
export function lkRhoXX(B: number, p: LkParams): number {
  const b = Math.abs(B);
  const bg = p.rho0 * (1 + p.slope * b);
  if (b === 0) return bg;
  const x = (2 * Math.PI ** 2 * KB * p.temperature * p.mass * ME) / (HBAR * E * b);
  const rd = Math.exp((-Math.PI * p.mass * ME) / (E * b * p.tauQ));
  const f = lkFrequency(p.density);
  let osc = 0;
  for (let s = 1; s <= (p.harmonic ? 2 : 1); s++) {
    const rs = p.g ? Math.cos((s * Math.PI * p.g * p.mass) / 2) : 1;
    osc += 4 * thermal(s * x) * rd ** s * rs * Math.cos(s * ((2 * Math.PI * f) / b - Math.PI));
  }
  return bg * (1 + osc);
}

/** Mulberry32 uniform [0, 1) and Box–Muller normal numbers (common practice). */
export function rng(seed: number) {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  return { uniform, normal };
}

/**
 * A measured sweep from −maxField to +maxField (`points` fields): columns B,
 * Rxx (= ρxx + mixing·ρxy + noise), Rxy (= ρxy + mixing·ρxx + noise), with
 * Gaussian noise of `noise`·ρ0. Electron sign: ρxy = −B/(n e).
 */
export function lkSweep(p: LkParams, maxField: number, points: number, mixing: number, noise: number, seed: number) {
  const { normal } = rng(seed);
  const B = new Float64Array(points);
  const rxx = new Float64Array(points);
  const rxy = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    const b = -maxField + (2 * maxField * i) / (points - 1);
    const xx = lkRhoXX(b, p);
    const xy = -b / (p.density * E);
    B[i] = b;
    rxx[i] = xx + mixing * xy + noise * p.rho0 * normal();
    rxy[i] = xy + mixing * xx + noise * p.rho0 * normal();
  }
  return { B, rxx, rxy };
}

/** Thermal factor X/sinh X at T (K), B (T), m* /m_e — for choosing windows. */
export function lkThermal(temperature: number, B: number, mass: number): number {
  return thermal((2 * Math.PI ** 2 * KB * temperature * mass * ME) / (HBAR * E * B));
}

/** Dingle factor exp(−π m* /(e B τ_q)). */
export function lkDingle(tauQ: number, B: number, mass: number): number {
  return Math.exp((-Math.PI * mass * ME) / (E * B * tauQ));
}
