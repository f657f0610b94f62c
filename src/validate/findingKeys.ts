/**
 * The names of the findings a grade can give a consequence to (targets.yaml `findings:`) and a
 * waiver can name (wafer.md `waivers[].finding`): what validation needs to check those fields.
 * What each finding means and how it is checked live in src/judge/findings.ts, which re-exports
 * these; they sit here so that validation never imports the judging stage.
 */

export type Consequence = "fail" | "marginal" | "note";
export const CONSEQUENCES: readonly Consequence[] = ["fail", "marginal", "note"];

export const FINDING_KEYS = [
  "incoherent_well",
  "beyond_critical_thickness",
  "parallel_conduction",
  "one_sign_field",
  "fit_undetermined",
  "coarse_profile",
] as const;
export type FindingKey = (typeof FINDING_KEYS)[number];

/** True for a finding name of FINDING_KEYS. */
export function isFindingKey(key: unknown): key is FindingKey {
  return typeof key === "string" && (FINDING_KEYS as readonly string[]).includes(key);
}
