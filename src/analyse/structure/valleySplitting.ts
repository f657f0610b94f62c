/**
 * Valley splitting predicted from a wafer's measured Ge depth profile: the
 * distribution of E_v over quantum dots, split into the part fixed by the
 * interface shape and the part from random alloy disorder.
 *
 * References: M. P. Losert et al., "Practical strategies for enhancing the
 * valley splitting in Si/SiGe quantum wells", Phys. Rev. B 108, 125405 (2023);
 * B. Paquelet Wuetz et al., "Atomic fluctuations lifting the energy degeneracy
 * in Si/SiGe quantum dots", Nat. Commun. 13, 7730 (2022); M. Friesen et al.,
 * Phys. Rev. B 75, 115318 (2007) (effective-mass valley coupling).
 *
 * Steps (one file each):
 *  1. Ge on the (001) layers from the fitted two-interface model, and where the
 *     measurement departs from it (valleyProfile.ts);
 *  2. the envelope |ψ|² on those layers from the 1-D Schrödinger equation with
 *     U = b·x − e·F·z (valleyEnvelope.ts);
 *  3.–4. Δ0 and the disorder σ (valleyCoupling.ts);
 *  5. E_v = 2·|Δ0 + δ|: E_v/2 is Rician with ν = |Δ0| and σ (numeric/rician.ts).
 *     Mean (Laguerre L_{1/2}), 10th percentile (root of the CDF) and the yield
 *     P(E_v ≥ threshold) = Q1(ν/σ, threshold/(2σ)) (Marcum Q), all exact, no
 *     Monte Carlo.
 *  6. standard uncertainties of the five figures from the profile fit's
 *     errors (valleyUncertainty.ts).
 * The field F is `valley_field` when set, else e·n/(ε0·11.7) with n the wafer's
 * density at peak mobility (mean over its devices) when it has transport
 * data, else 5 MV/m.
 *
 * Constants (REFERENCES §16). Confirmed: a0 = 0.5431 nm (CODATA a(Si), as §16
 * marks it); m_t = 0.19 m_e (standard Si transverse mass, found in several
 * semiconductor references); E_v = 2|Δ| for the two-valley Hamiltonian and the
 * measured range of 20–300 µeV (Losert et al. 2023, introduction) against which
 * the demo figures were read. Derived: a_dot(2 meV) = 14.16 nm; the σ²
 * prefactor a0²/(8π·a_dot²) (re-derived in valleyCoupling.ts and checked by a
 * Monte Carlo test). From memory, not checked against the papers: k0 =
 * 0.82·2π/a0, m_l = 0.916 m_e (textbooks often give 0.98), b = 0.5 eV per unit Ge
 * (≈ 150 meV at x = 0.3), ε_r(Si) = 11.7.
 *
 * A model estimate of a distribution, not a measurement: it assumes the
 * profile represents the whole wafer and ignores atomic steps, miscut and
 * strain variations.
 * Units: SI inside (J, V/m, m⁻²); depths in nm as the profile gives them.
 * Pure; returns { ok: false, reason } when the data do not allow it.
 */
import { ELEMENTARY_CHARGE, VACUUM_PERMITTIVITY } from "../../physics/constants.ts";
import { SI_RELATIVE_PERMITTIVITY, VALLEY_LATTICE_CONSTANT } from "../../physics/siliconValley.ts";
import { marcumQ1, ricianMean, ricianPdf, ricianQuantile } from "../numeric/rician.ts";
import type { InterfaceFit } from "./depthProfile.ts";
import { valleyCoupling } from "./valleyCoupling.ts";
import { valleyEnvelope } from "./valleyEnvelope.ts";
import { valleyUncertainty } from "./valleyUncertainty.ts";
import { layerProfile, profileDeparture, type ProfileDeparture } from "./valleyProfile.ts";

export interface ValleySettings {
  /** Vertical field, V/m; null: from the electron density, else DEFAULT_VALLEY_FIELD. */
  field: number | null;
  /** Orbital energy of the dot, J. */
  orbitalEnergy: number;
  /** Conduction-band offset per unit Ge fraction, J. */
  bandOffset: number;
  /** E_v threshold of the yield, J. */
  threshold: number;
}

export interface ValleyInput {
  /** Measured profile: depth nm, Ge fraction. */
  depth: readonly number[];
  ge: readonly number[];
  top: InterfaceFit;
  bottom: InterfaceFit;
  /** Electron density of the wafer, m⁻² (density at peak mobility), when known. */
  electronDensity?: number;
}

/** Field used when neither the setting nor transport data give one, V/m (5 MV/m). */
export const DEFAULT_VALLEY_FIELD = 5e6;
/** Grid spacing of the Schrödinger solution, nm. */
export const VALLEY_GRID_NM = 0.01;

export type ValleySplitting =
  | {
      ok: true;
      /** The (001) layers: depth nm, model Ge fraction, normalised |ψ|² weight. */
      layers: { depth: number[]; ge: number[]; weight: number[] };
      xTop: number;
      xBottom: number;
      xWell: number;
      departure: ProfileDeparture;
      field: number;
      fieldSource: "setting" | "density" | "default";
      /** m⁻², when the field came from it. */
      electronDensity?: number;
      settings: ValleySettings;
      /** nm */
      dotRadius: number;
      /** Ground-state energy of the envelope, J. */
      groundEnergy: number;
      /** Δ0, J. */
      deterministic: { re: number; im: number };
      /** 2·|Δ0|, J. */
      deterministicSplitting: number;
      /** σ of each component of δ, J. */
      sigma: number;
      /** Mean and 10th percentile of E_v, J. */
      mean: number;
      p10: number;
      /** P(E_v ≥ threshold), 0 … 1. */
      yieldFraction: number;
      /** Density of E_v for plotting: energy J, probability density per J. */
      distribution: { energy: number[]; density: number[] };
      /** Standard uncertainties of the five figures from the profile fit's errors (valleyUncertainty.ts), same units; NaN where a shifted input gave no prediction. */
      stdErr: ValleyFigures;
    }
  | { ok: false; reason: string };

const DISTRIBUTION_POINTS = 121;

/** The five figures of a prediction (J, J, J, J, fraction). */
export interface ValleyFigures {
  mean: number;
  p10: number;
  deterministicSplitting: number;
  sigma: number;
  yieldFraction: number;
}

function fieldFor(settings: ValleySettings, density: number | undefined) {
  if (settings.field !== null) return { field: settings.field, fieldSource: "setting" as const };
  if (density !== undefined && density > 0 && Number.isFinite(density)) {
    return {
      field: (ELEMENTARY_CHARGE * density) / (VACUUM_PERMITTIVITY * SI_RELATIVE_PERMITTIVITY),
      fieldSource: "density" as const,
      electronDensity: density,
    };
  }
  return { field: DEFAULT_VALLEY_FIELD, fieldSource: "default" as const };
}

/** The layer model, envelope and couplings of one prediction, or the reason there is none. */
function couplings(input: ValleyInput, settings: ValleySettings) {
  const latticeNm = VALLEY_LATTICE_CONSTANT * 1e9;
  const profile = layerProfile(input.depth, input.ge, input.top, input.bottom, latticeNm);
  if (!profile) return { ok: false as const, reason: "no measured point in the middle half of the well, so its Ge fraction x_w is unknown" };
  const f = fieldFor(settings, input.electronDensity);
  const env = valleyEnvelope({
    ge: profile.at,
    topCentre: input.top.centre,
    bottomCentre: input.bottom.centre,
    layerDepth: profile.depth,
    bandOffset: settings.bandOffset,
    field: f.field,
    stepNm: VALLEY_GRID_NM,
  });
  if (!env.weight.every(Number.isFinite)) return { ok: false as const, reason: "the envelope vanished on every atomic layer" };
  const c = valleyCoupling(profile.depth, profile.ge, env.weight, settings.bandOffset, settings.orbitalEnergy, latticeNm);
  if (!(c.sigma > 0))
    return { ok: false as const, reason: "no Ge within the envelope, so the alloy-disorder spread is zero and the Rician model does not apply" };
  return { ok: true as const, profile, f, env, c };
}

/** The five figures from |Δ0| = ν and σ (Rician, numeric/rician.ts). */
function figures(nu: number, sigma: number, threshold: number): ValleyFigures {
  return {
    mean: 2 * ricianMean(nu, sigma),
    p10: 2 * ricianQuantile(0.1, nu, sigma),
    deterministicSplitting: 2 * nu,
    sigma,
    yieldFraction: marcumQ1(nu / sigma, threshold / 2 / sigma),
  };
}

/** The five figures alone, for the uncertainty (valleyUncertainty.ts); undefined when there is no prediction. */
export function valleyFigures(input: ValleyInput, settings: ValleySettings): ValleyFigures | undefined {
  const k = couplings(input, settings);
  return k.ok ? figures(k.c.magnitude, k.c.sigma, settings.threshold) : undefined;
}

/** Predicts the valley-splitting distribution (see module comment). Never throws for data. */
export function predictValleySplitting(input: ValleyInput, settings: ValleySettings): ValleySplitting {
  const k = couplings(input, settings);
  if (!k.ok) return k;
  const { profile, f, env, c } = k;
  const nu = c.magnitude;
  const sigma = c.sigma;
  // Plotted range: the bulk of the distribution, and the threshold with some room beyond it.
  const top = Math.max(2 * (nu + 5 * sigma), 1.2 * settings.threshold);
  const energy = Array.from({ length: DISTRIBUTION_POINTS }, (_, i) => (top * i) / (DISTRIBUTION_POINTS - 1));
  const central = figures(nu, sigma, settings.threshold);
  return {
    ok: true,
    layers: { depth: profile.depth, ge: profile.ge, weight: env.weight },
    xTop: profile.xTop,
    xBottom: profile.xBottom,
    xWell: profile.xWell,
    departure: profileDeparture(input.depth, input.ge, profile),
    ...f,
    settings,
    dotRadius: c.dotRadius,
    groundEnergy: env.energy,
    deterministic: { re: c.re, im: c.im },
    ...central,
    stdErr: valleyUncertainty(input, settings, central),
    // E_v = 2R: f_E(E) = f_R(E/2)/2.
    distribution: { energy, density: energy.map((e) => ricianPdf(e / 2, nu, sigma) / 2) },
  };
}
