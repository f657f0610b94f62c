/**
 * Analysis settings: site-wide `data/analysis.yaml`, overridden per wafer by the
 * `analysis:` block of wafer.md. Every setting has a documented default
 * (docs/formats.md); values with dimensions are typed with units and converted
 * here, once. Inside the analysis everything is SI.
 */
import { didYouMean, InputError, ProblemList, show } from "../model/problem.ts";
import { parseQuantity } from "./units.ts";
import { DEFAULT_MAX_IMAGE_PIXELS } from "../read/micrograph.ts";

export interface AnalysisSettings {
  /** Upper end of the low-field range for the Hall fit, T. */
  hall_max_field: number;
  /** R² below which a Hall fit is flagged as poor. */
  hall_min_r2: number;
  /** Upper end of the percolation fit window, m^-2 (null: derived from the data). */
  percolation_max_density: number | null;
  /** Percolation exponent p, or "free" to fit it. */
  percolation_exponent: number | "free";
  /** Density window for μ ∝ n^α, m^-2 (null: below the mobility peak). */
  exponent_density_range: [number, number] | null;
  /** Shubnikov–de Haas field window, T. */
  sdh_min_field: number;
  sdh_max_field: number;
  /** Spin × valley degeneracy g_s·g_v. */
  degeneracy: number;
  /** Effective mass in units of m_e. */
  effective_mass: number;
  /** Hall–SdH density mismatch above which parallel conduction is flagged, %. */
  sdh_mismatch_tolerance: number;
  /** Order of the smooth polynomial background (in B) of the SdH spectrum and fit, 0–4. */
  sdh_background_order: number;
  /** Smallest R² of the oscillation fit. */
  sdh_min_r2: number;
  /** Largest relative standard error of τ_q, %. */
  sdh_max_lifetime_error: number;
  /** Amplitude factor A of the oscillation fit, or "free" to fit it. */
  sdh_amplitude_factor: number | "free";
  /** Largest micrograph accepted, width × height in pixels, checked from the PNG header before decoding. */
  max_image_pixels: number;
  /** Valley-splitting prediction: vertical field, V/m (null: from the density at peak mobility, else 5 MV/m). */
  valley_field: number | null;
  /** Valley-splitting prediction: orbital energy of the dot, J. */
  valley_dot_orbital_energy: number;
  /** Valley-splitting prediction: conduction-band offset per unit Ge fraction, J. */
  valley_band_offset_per_ge: number;
  /** Valley-splitting prediction: E_v threshold of the yield, J. */
  valley_splitting_threshold: number;
}

type Spec =
  | { kind: "quantity"; unit: string; si: number; doc: string; nullable?: boolean }
  | { kind: "number"; min: number; max: number; doc: string; orFree?: boolean }
  | { kind: "range"; unit: string; si: number; doc: string };

/** Registry: key → how it is typed, its SI factor, and what it means. */
export const SETTING_SPECS: Record<keyof AnalysisSettings, Spec> = {
  hall_max_field: { kind: "quantity", unit: "T", si: 1, doc: "upper end of the low-field range used for the Hall slope" },
  hall_min_r2: { kind: "number", min: 0, max: 1, doc: "R² below which the Hall fit is flagged as poor" },
  percolation_max_density: { kind: "quantity", unit: "cm^-2", si: 1e4, doc: "upper end of the percolation fit window", nullable: true },
  percolation_exponent: { kind: "number", min: 0.5, max: 3, doc: "percolation exponent p, or free", orFree: true },
  exponent_density_range: { kind: "range", unit: "cm^-2", si: 1e4, doc: "density window of the mobility power-law fit" },
  sdh_min_field: { kind: "quantity", unit: "T", si: 1, doc: "lower end of the Shubnikov–de Haas window" },
  sdh_max_field: { kind: "quantity", unit: "T", si: 1, doc: "upper end of the Shubnikov–de Haas window" },
  degeneracy: { kind: "number", min: 1, max: 12, doc: "spin × valley degeneracy g_s·g_v" },
  effective_mass: { kind: "number", min: 0.01, max: 2, doc: "effective mass in units of the electron mass" },
  sdh_mismatch_tolerance: { kind: "quantity", unit: "%", si: 1, doc: "Hall–SdH mismatch above which parallel conduction is flagged" },
  sdh_background_order: { kind: "number", min: 0, max: 4, doc: "order of the polynomial background in B of the SdH spectrum and fit" },
  sdh_min_r2: { kind: "number", min: 0, max: 1, doc: "R² of the SdH oscillation fit below which its figures are not determined" },
  sdh_max_lifetime_error: { kind: "quantity", unit: "%", si: 1, doc: "relative standard error of τ_q above which it is not determined" },
  sdh_amplitude_factor: { kind: "number", min: 0.01, max: 2, doc: "amplitude factor A of the SdH fit, or free", orFree: true },
  max_image_pixels: { kind: "number", min: 65_536, max: 1e9, doc: "largest micrograph accepted, width × height in pixels" },
  valley_field: { kind: "quantity", unit: "MV/m", si: 1e6, doc: "vertical electric field of the valley-splitting prediction", nullable: true },
  valley_dot_orbital_energy: {
    kind: "quantity",
    unit: "meV",
    si: 1.602176634e-22,
    doc: "orbital energy of the quantum dot in the valley-splitting prediction",
  },
  valley_band_offset_per_ge: {
    kind: "quantity",
    unit: "eV",
    si: 1.602176634e-19,
    doc: "conduction-band offset per unit Ge fraction in the valley-splitting prediction",
  },
  valley_splitting_threshold: { kind: "quantity", unit: "ueV", si: 1.602176634e-25, doc: "valley splitting a dot needs, for the predicted yield" },
};

export const DEFAULT_SETTINGS: AnalysisSettings = {
  hall_max_field: 0.2,
  hall_min_r2: 0.995,
  percolation_max_density: null,
  percolation_exponent: 1.31,
  exponent_density_range: null,
  sdh_min_field: 0.3,
  sdh_max_field: 2.0,
  degeneracy: 4,
  effective_mass: 0.19,
  sdh_mismatch_tolerance: 5,
  sdh_background_order: 2,
  sdh_min_r2: 0.9,
  sdh_max_lifetime_error: 30,
  sdh_amplitude_factor: "free",
  max_image_pixels: DEFAULT_MAX_IMAGE_PIXELS,
  valley_field: null,
  valley_dot_orbital_energy: 2e-3 * 1.602176634e-19,
  valley_band_offset_per_ge: 0.5 * 1.602176634e-19,
  valley_splitting_threshold: 100e-6 * 1.602176634e-19,
};

/** Validates a settings mapping (from analysis.yaml or a wafer's `analysis:` block) over a base. */
export function applySettings(
  base: AnalysisSettings,
  raw: unknown,
  where: { file: string; field: string; line?: number; lineOf?: (key: string) => number | undefined },
): AnalysisSettings {
  if (raw === undefined || raw === null) return base;
  if (typeof raw !== "object" || Array.isArray(raw)) {
    const under = where.field ? ` indented under ${where.field}:` : "";
    throw new InputError({
      file: where.file,
      line: where.line,
      field: where.field,
      message: "analysis settings must be a mapping",
      expected: "key: value pairs",
      found: show(raw),
      fix: `write one "setting: value" per line${under}, such as hall_max_field: "0.2 T"; see docs/formats.md, section Analysis settings`,
    });
  }
  const out: AnalysisSettings = { ...base };
  const known = Object.keys(SETTING_SPECS);
  // Each setting is read on its own, so every bad one is reported (ProblemList).
  const list = new ProblemList(where.file);
  for (const [key, value] of Object.entries(raw as Record<string, unknown>)) {
    const field = where.field ? `${where.field}.${key}` : key;
    const line = where.lineOf?.(key);
    if (!(key in SETTING_SPECS)) {
      const hint = didYouMean(key, known);
      list.add({
        file: where.file,
        line,
        field,
        message: "unknown analysis setting",
        expected: `one of ${known.join(", ")}`,
        found: JSON.stringify(key),
        fix: hint ? `did you mean "${hint}"?` : "remove it or check docs/formats.md",
      });
      continue;
    }
    const spec = SETTING_SPECS[key as keyof AnalysisSettings];
    const fail = (expected: string, found: string): never => {
      throw new InputError({
        file: where.file,
        line,
        field,
        message: `cannot read setting (${spec.doc})`,
        expected,
        found,
        fix: "see docs/formats.md, section Analysis settings",
      });
    };
    list.attempt(() => {
      (out as unknown as Record<string, unknown>)[key] = readSetting(spec, value, fail);
    });
  }
  list.done();
  return out;
}

function readSetting(spec: Spec, value: unknown, fail: (e: string, f: string) => never): unknown {
  if (spec.kind === "quantity") {
    if (value === null && spec.nullable) return null;
    const q = parseQuantity(value, spec.unit);
    if (!q.ok) return fail(q.expected, q.found);
    if (q.value <= 0) return fail("a positive value", show(value));
    return q.value * spec.si;
  }
  if (spec.kind === "number") {
    if (spec.orFree && value === "free") return "free";
    if (typeof value !== "number" || !Number.isFinite(value)) return fail(spec.orFree ? 'a number or "free"' : "a number", show(value));
    if (value < spec.min || value > spec.max) return fail(`a number between ${spec.min} and ${spec.max}`, String(value));
    return value;
  }
  if (!Array.isArray(value) || value.length !== 2) return fail(`two values with units, such as ["1e10 ${spec.unit}", "1e11 ${spec.unit}"]`, show(value));
  const pair = value.map((v) => {
    const q = parseQuantity(v, spec.unit);
    if (!q.ok) return fail(q.expected, q.found);
    return q.value * spec.si;
  }) as [number, number];
  if (!(pair[0] < pair[1])) return fail("the lower end first", show(value));
  return pair;
}
