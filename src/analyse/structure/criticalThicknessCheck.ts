/**
 * Is the quantum well thin enough to stay coherent? Compares the well's
 * thickness with its critical thickness for the well's in-plane misfit strain:
 * Matthews–Blakeslee (single layer, 60° dislocations, 8π form; Matthews &
 * Blakeslee, J. Cryst. Growth 27, 118 (1974)) decides the flag, People–Bean
 * (Appl. Phys. Lett. 47, 322 (1985)) is reported beside it.
 *
 * Strain: the measured ε∥ of the well (X-ray) when available; otherwise the
 * design strain of a Si well on a fully relaxed buffer of the stack's Ge
 * fraction (strainedSiOnRelaxedSiGe). The well is taken as Si (a = 5.431 Å,
 * ν of Si). Thickness: the stack's design thickness_nm when given, else the
 * thickness measured on a depth profile. Lengths in m. Never throws for data.
 */
import type { Layer } from "../../validate/wafer.ts";
import { A_SI, poissonRatio, strainedSiOnRelaxedSiGe } from "../../physics/sige.ts";
import { compareWithCritical, matthewsBlakeslee, peopleBean } from "./criticalThickness.ts";
import type { WellStrain } from "./wellStrain.ts";

export type CriticalThicknessCheck =
  | {
      ok: true;
      /** In-plane misfit strain used, 1. */
      strain: number;
      strainStdErr: number;
      strainSource: "well-peak" | "pseudomorphic-on-buffer" | "design";
      /** Critical thicknesses, m. */
      matthewsBlakeslee: number;
      matthewsBlakesleeStdErr: number;
      peopleBean?: number;
      /** Well thickness compared, m. */
      thickness: number;
      thicknessSource: "stack" | "profile";
      beyond: boolean;
      /** h_c(MB) − thickness, m (negative when beyond). */
      margin: number;
      ratio: number;
      /** One plain sentence for the page. */
      statement: string;
    }
  | { ok: false; reason: string };

const NU_SI = poissonRatio(0);

function mbOf(strain: number): number | undefined {
  const r = matthewsBlakeslee(strain, A_SI, NU_SI);
  return r.ok ? r.thickness : undefined;
}

function strainToUse(
  stack: readonly Layer[],
  strain: WellStrain | undefined,
): { e: number; se: number; source: "well-peak" | "pseudomorphic-on-buffer" | "design" } | string {
  if (strain?.ok) return { e: strain.epsParallel, se: strain.epsParallelStdErr, source: strain.source };
  const x = stack.find((l) => l.role === "buffer")?.ge ?? stack.find((l) => l.role === "barrier")?.ge;
  if (x === undefined) return `no well strain from X-ray${strain && !strain.ok ? ` (${strain.reason})` : ""} and no buffer or barrier Ge fraction in the stack`;
  return { e: strainedSiOnRelaxedSiGe(x).epsParallel, se: 0, source: "design" };
}

const nm = (m: number) => `${(m * 1e9).toPrecision(3)} nm`;

/** Critical-thickness check of the well (see module comment). `profileThickness` in m. */
export function checkCriticalThickness(stack: readonly Layer[], strain: WellStrain | undefined, profileThickness?: number): CriticalThicknessCheck {
  const s = strainToUse(stack, strain);
  if (typeof s === "string") return { ok: false, reason: s };
  const mb = matthewsBlakeslee(s.e, A_SI, NU_SI);
  if (!mb.ok) return { ok: false, reason: mb.reason };
  const pb = peopleBean(s.e, A_SI, NU_SI);
  const design = stack.find((l) => l.role === "well")?.thickness_nm;
  const thickness = design !== undefined ? design * 1e-9 : profileThickness;
  if (thickness === undefined || !(thickness > 0))
    return { ok: false, reason: "the well thickness is neither in the stack (thickness_nm) nor measured on a depth profile" };
  const hi = s.se > 0 ? mbOf(Math.abs(s.e) - s.se) : undefined;
  const lo = s.se > 0 ? mbOf(Math.abs(s.e) + s.se) : undefined;
  const mbErr = hi !== undefined && lo !== undefined ? Math.abs(hi - lo) / 2 : 0;
  const c = compareWithCritical(thickness, mb.thickness);
  const from = design !== undefined ? "design" : "measured";
  const strainWords = `${(s.e * 100).toFixed(3)} % in-plane strain (${s.source === "design" ? "design: Si on a fully relaxed buffer" : s.source === "well-peak" ? "from the well peak" : "well assumed pseudomorphic on the buffer"})`;
  const statement = c.beyond
    ? `The ${from} well thickness ${nm(thickness)} exceeds its Matthews–Blakeslee critical thickness ${nm(mb.thickness)} for ${strainWords}: misfit dislocations can relax the well and scatter carriers.`
    : `The ${from} well thickness ${nm(thickness)} is below its Matthews–Blakeslee critical thickness ${nm(mb.thickness)} for ${strainWords}, a margin of ${nm(c.margin)}.`;
  return {
    ok: true,
    strain: s.e,
    strainStdErr: s.se,
    strainSource: s.source,
    matthewsBlakeslee: mb.thickness,
    matthewsBlakesleeStdErr: mbErr,
    peopleBean: pb.ok ? pb.thickness : undefined,
    thickness,
    thicknessSource: design !== undefined ? "stack" : "profile",
    beyond: c.beyond,
    margin: c.margin,
    ratio: c.ratio,
    statement,
  };
}
