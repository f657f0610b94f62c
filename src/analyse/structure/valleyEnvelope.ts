/**
 * Envelope function of the lowest conduction subband along the growth axis,
 * for the valley-splitting prediction (valleySplitting.ts).
 *
 * Model: the 1-D effective-mass Schrödinger equation
 *   −ħ²/(2 m_l)·ψ'' + U(z)·ψ = E·ψ,  U(z) = b·x(z) − e·F·z,
 * z = −depth (growth axis toward the surface), m_l the longitudinal mass of Si,
 * b the conduction-band offset per unit Ge fraction, F the vertical field
 * (F > 0 pulls electrons toward the surface). Method: second-order finite
 * differences on a uniform grid (spacing ≤ `stepNm`, default 0.01 nm) with hard
 * walls (ψ = 0) exactly 10 nm above c_top and 10 nm below c_bot — walls further
 * out would let the ground state slide into the barrier against the far wall
 * once a field is applied. The symmetric tridiagonal ground state is found by
 * Sturm bisection and inverse iteration (numeric/tridiagonalGroundState.ts).
 * The envelope at the atomic layers is the linear interpolation of the grid
 * solution; the layer weights are w_l = |ψ(z_l)|²/Σ_l |ψ(z_l)|² (Σ w_l = 1).
 * Friesen et al., Phys. Rev. B 75, 115318 (2007) (effective-mass valley
 * coupling); Losert et al., Phys. Rev. B 108, 125405 (2023).
 *
 * Inputs: x(depth nm) → Ge fraction; b in J; F in V/m; depths in nm.
 * Returns the ground energy (J, relative to the potential's zero at depth 0)
 * and the layer weights. Throws RangeError for a non-positive step or walls
 * that do not enclose the layers (programming errors).
 */
import { ELEMENTARY_CHARGE, HBAR } from "../../physics/constants.ts";
import { SI_LONGITUDINAL_MASS } from "../../physics/siliconValley.ts";
import { tridiagonalGroundState } from "../numeric/tridiagonalGroundState.ts";

export interface EnvelopeInput {
  /** Ge fraction at a depth (nm). */
  ge: (depthNm: number) => number;
  /** Interface centres, nm. */
  topCentre: number;
  bottomCentre: number;
  /** Layer depths, nm (inside the walls). */
  layerDepth: readonly number[];
  /** Band offset per unit Ge fraction, J. */
  bandOffset: number;
  /** Vertical field, V/m. */
  field: number;
  /** Grid spacing, nm (at most this; default 0.01). */
  stepNm?: number;
  /** Effective mass along z, kg (default m_l of Si). */
  mass?: number;
}

export interface Envelope {
  /** Ground-state energy, J. */
  energy: number;
  /** Normalised layer weights w_l (Σ = 1). */
  weight: number[];
  /** Grid actually used: walls (nm) and spacing (nm). */
  walls: [number, number];
  stepNm: number;
}

/** Distance of the hard walls beyond the interface centres, nm. */
export const WALL_DISTANCE_NM = 10;

/**
 * Ground state of H = −ħ²/(2m)·d²/dz² + U on the interior points of a uniform grid between hard walls:
 * diagonal ħ²/(m h²) + U_i, off-diagonal −ħ²/(2m h²). Returns the energy (J) and ψ on the interior points.
 */
export function groundStateOnGrid(potential: Float64Array, stepM: number, mass: number) {
  const t = (HBAR * HBAR) / (2 * mass * stepM * stepM);
  const d = new Float64Array(potential.length);
  for (let i = 0; i < d.length; i++) d[i] = 2 * t + potential[i];
  const e = new Float64Array(Math.max(0, d.length - 1)).fill(-t);
  return tridiagonalGroundState(d, e);
}

export function valleyEnvelope(input: EnvelopeInput): Envelope {
  const maxStep = input.stepNm ?? 0.01;
  if (!(maxStep > 0)) throw new RangeError(`valleyEnvelope: grid step must be positive, got ${maxStep}`);
  const lo = input.topCentre - WALL_DISTANCE_NM;
  const hi = input.bottomCentre + WALL_DISTANCE_NM;
  const intervals = Math.ceil((hi - lo) / maxStep - 1e-9);
  const h = (hi - lo) / intervals;
  const interior = intervals - 1;
  const potential = new Float64Array(interior);
  for (let i = 0; i < interior; i++) {
    const depth = lo + (i + 1) * h;
    // z = −depth: −e·F·z = +e·F·depth (nm → m).
    potential[i] = input.bandOffset * input.ge(depth) + ELEMENTARY_CHARGE * input.field * depth * 1e-9;
  }
  const g = groundStateOnGrid(potential, h * 1e-9, input.mass ?? SI_LONGITUDINAL_MASS);
  const psiAt = (depth: number) => {
    const u = (depth - lo) / h;
    if (!(u > 0 && u < intervals)) throw new RangeError(`valleyEnvelope: layer at ${depth} nm lies outside the walls [${lo}, ${hi}] nm`);
    const k = Math.floor(u);
    const f = u - k;
    // Grid node j (0 … intervals) holds ψ = 0 at the walls, vector[j − 1] inside.
    const node = (j: number) => (j <= 0 || j >= intervals ? 0 : g.vector[j - 1]);
    return (1 - f) * node(k) + f * node(k + 1);
  };
  const raw = input.layerDepth.map((d) => psiAt(d) ** 2);
  const sum = raw.reduce((a, b) => a + b, 0);
  return { energy: g.value, weight: raw.map((v) => v / sum), walls: [lo, hi], stepNm: h };
}
