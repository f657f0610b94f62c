/**
 * Findings: what the analysis raises about a wafer besides its metric values,
 * made into judged checks (docs/formats.md, section Targets, "Findings").
 *
 * Each finding is checked from the wafer's analysis (the slim form is enough:
 * only scalars and reasons are read). A check is `checked` when the wafer had
 * the data it needs, and `raised` lists, in plain words, where the finding was
 * made (empty: checked and not raised). Each finding has a default
 * consequence — fail, marginal or note — that targets.yaml can set per grade.
 *
 *   incoherent_well            well coherence from geometric phase analysis (images)
 *   beyond_critical_thickness  well thicker than its Matthews–Blakeslee critical thickness
 *   parallel_conduction        Hall density differs from the SdH density beyond tolerance
 *   one_sign_field             a field sweep with one field sign: not (anti)symmetrised
 *   fit_undetermined           a fit that had its data but was rejected or left undetermined
 *   coarse_profile             depth profile sampled too coarsely for the interface widths
 */
import type { WaferAnalysis } from "../analyse/wafer.ts";
import { profileSampling, MIN_POINTS_ACROSS_INTERFACE } from "../analyse/structure/profileSampling.ts";

import { FINDING_KEYS, type Consequence, type FindingKey } from "../validate/findingKeys.ts";
export { CONSEQUENCES, FINDING_KEYS, isFindingKey, type Consequence, type FindingKey } from "../validate/findingKeys.ts";

export interface FindingSpec {
  key: FindingKey;
  label: string;
  description: string;
  /** Consequence when the grade does not set one. */
  defaultConsequence: Consequence;
  /** What "checked and not raised" means, for the page. */
  clear: string;
}

export const FINDING_SPECS: readonly FindingSpec[] = [
  {
    key: "incoherent_well",
    label: "Incoherent well",
    description: "the well's in-plane lattice does not run on from the reference across its interfaces (geometric phase analysis of the micrographs)",
    defaultConsequence: "fail",
    clear: "the well is coherent",
  },
  {
    key: "beyond_critical_thickness",
    label: "Beyond critical thickness",
    description: "the well is thicker than its Matthews–Blakeslee critical thickness",
    defaultConsequence: "fail",
    clear: "the well is within its critical thickness",
  },
  {
    key: "parallel_conduction",
    label: "Parallel conduction",
    description: "the Hall density differs from the Shubnikov–de Haas density of the well by more than sdh_mismatch_tolerance",
    defaultConsequence: "fail",
    clear: "Hall and SdH densities agree",
  },
  {
    key: "one_sign_field",
    label: "One-sign field sweep",
    description: "a field sweep has one field sign only, so Rxx and Rxy are not (anti)symmetrised",
    defaultConsequence: "marginal",
    clear: "every field sweep has both field signs",
  },
  {
    key: "fit_undetermined",
    label: "Rejected or undetermined fit",
    description:
      "a fit that had its data (Hall slope, gate calibration, percolation, power law, quantum lifetime, depth-profile edges, X-ray, micrograph profile or strain maps) was rejected or left undetermined",
    defaultConsequence: "marginal",
    clear: "every fit with data was accepted",
  },
  {
    key: "coarse_profile",
    label: "Profile too coarse",
    description: `the depth profile has fewer than ${MIN_POINTS_ACROSS_INTERFACE} depth steps across an interface's 10–90 % width`,
    defaultConsequence: "marginal",
    clear: "the profile resolves both interfaces",
  },
];

export const FINDING_BY_KEY: ReadonlyMap<string, FindingSpec> = new Map(FINDING_SPECS.map((f) => [f.key, f]));

export interface FindingCheck {
  key: FindingKey;
  /** False when the wafer lacks the data the check needs. */
  checked: boolean;
  /** Where the finding was raised, in plain words; empty when not raised. */
  raised: string[];
  /** Why it was not checked (when checked is false). */
  why?: string;
}

const base = (f: string) => f.split("/").slice(-2).join("/");

function check(key: FindingKey, checked: boolean, raised: string[], why: string): FindingCheck {
  return checked ? { key, checked, raised } : { key, checked, raised: [], why };
}

/** Every finding check of one wafer, in FINDING_KEYS order. */
export function findingChecks(a: WaferAnalysis | undefined): FindingCheck[] {
  if (!a) return FINDING_KEYS.map((k) => check(k, false, [], "the wafer was not analysed"));
  const images = a.images?.images ?? [];
  const coherence = images.flatMap((im) => (im.coherence.ok ? [{ file: im.input.file, c: im.coherence }] : []));
  const crit = a.structure?.critical;
  const points = a.devices.flatMap((d) => d.points.map((p) => ({ d, p })));
  const depth = a.devices.filter((d) => d.depth);
  const sampled = (a.structure?.profiles ?? []).flatMap((p) => (p.result.ok ? [{ file: p.data.file, r: p.result }] : []));
  return [
    check(
      "incoherent_well",
      coherence.length > 0,
      coherence.flatMap(({ file, c }) => (c.coherent ? [] : c.findings.map((f) => `${base(file)}: ${f}`))),
      "no micrograph gave strain maps of the well",
    ),
    check("beyond_critical_thickness", !!crit?.ok, crit?.ok && crit.beyond ? [crit.statement] : [], crit && !crit.ok ? crit.reason : "no structure data"),
    check(
      "parallel_conduction",
      depth.some((d) => d.depth!.points.some((p) => p.mismatch)),
      depth.flatMap((d) =>
        d.depth!.parallelConduction.length
          ? [`device ${d.id}: Hall and SdH densities differ beyond tolerance at ${d.depth!.parallelConduction.map(base).join(", ")}`]
          : [],
      ),
      "no field sweep gave a Shubnikov–de Haas density to compare",
    ),
    check(
      "one_sign_field",
      points.length > 0,
      oneSign(points.filter(({ p }) => !p.symmetrised).map(({ d, p }) => ({ id: d.id, file: p.file }))),
      "no analysed field sweep",
    ),
    check("fit_undetermined", true, undeterminedFits(a), ""),
    check(
      "coarse_profile",
      sampled.length > 0,
      sampled.flatMap(({ file, r }) => {
        const s = profileSampling(r.depthStep, [r.top.width10to90, r.bottom.width10to90]);
        return s.coarse
          ? [
              `${base(file)}: ${s.pointsAcross.toFixed(1)} depth steps of ${s.step.toPrecision(2)} nm across the narrower interface; at least ${MIN_POINTS_ACROSS_INTERFACE} are needed, so the widths are upper bounds`,
            ]
          : [];
      }),
      "no depth profile was analysed",
    ),
  ];
}

function oneSign(list: { id: string; file: string }[]): string[] {
  const byDevice = new Map<string, string[]>();
  for (const x of list) byDevice.set(x.id, [...(byDevice.get(x.id) ?? []), base(x.file)]);
  return [...byDevice].map(
    ([id, files]) =>
      `device ${id}: ${files.length} field sweep${files.length === 1 ? "" : "s"} with one field sign (${files.join(", ")}), not (anti)symmetrised`,
  );
}

/**
 * Fits that had their data but gave no accepted result. Missing data (no gate
 * sweeps, no oscillations, no micrograph) is not a finding: the metric it
 * feeds is then `unmeasured` or, when required, `incomplete`.
 */
function undeterminedFits(a: WaferAnalysis): string[] {
  const out: string[] = [];
  for (const d of a.devices) {
    for (const s of d.skipped) out.push(`device ${d.id}: ${base(s.file)} not analysed: ${s.reason}`);
    const poor = d.points.filter((p) => p.hall.poor);
    if (poor.length) out.push(`device ${d.id}: Hall fit below the R² limit at ${poor.map((p) => `${base(p.file)} (R² ${p.hall.r2.toFixed(4)})`).join(", ")}`);
    const x = d.depth;
    if (!x) continue;
    if (d.points.length >= 3 && !x.calibration.ok) out.push(`device ${d.id}: gate calibration not determined: ${x.calibration.reason}`);
    if (d.points.length >= 3 && !x.powerLaw.ok) out.push(`device ${d.id}: mobility power law not determined: ${x.powerLaw.reason}`);
    const zeroField = x.gateSweeps.filter((g) => Math.abs(g.field_T) <= 1e-3);
    if (zeroField.length && x.calibration.ok && !x.percolation.ok) out.push(`device ${d.id}: percolation fit rejected: ${x.percolation.reason}`);
    // Judged at the level of the figure: the device's quantum lifetime (median over the points with a
    // Dingle fit) is undetermined when no point gave one although some had oscillations and a temperature
    // (without a temperature the thermal factor is unknown: missing data, not an undetermined fit).
    const withTemperature = new Set(d.points.filter((p) => p.temperature_K !== undefined).map((p) => p.file));
    if (x.points.some((p) => p.sdh.ok && withTemperature.has(p.file)) && !x.quantumLifetime.ok)
      out.push(`device ${d.id}: quantum lifetime not determined: ${x.quantumLifetime.reason}`);
  }
  const s = a.structure;
  for (const p of s?.profiles ?? []) if (!p.result.ok) out.push(`${base(p.data.file)}: depth profile not fitted: ${p.result.reason}`);
  if (s?.xrd && !s.xrd.buffer.ok) out.push(`X-ray: buffer figures not determined: ${s.xrd.buffer.reason}`);
  if (s?.xrd && !s.xrd.strain.ok) out.push(`X-ray: well strain not determined: ${s.xrd.strain.reason}`);
  for (const im of a.images?.images ?? []) {
    if (im.input.kind === "haadf" && !im.profile.ok) out.push(`${base(im.input.file)}: Z-contrast profile not fitted: ${im.profile.reason}`);
    if (!im.gpa.ok) out.push(`${base(im.input.file)}: strain maps not determined: ${im.gpa.reason}`);
  }
  return out;
}
