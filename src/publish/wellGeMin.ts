/**
 * How a wafer page shows the minimum Ge fraction in the well (src/analyse/structure/depthProfile.ts): the
 * measured value first, with its standard uncertainty u, propagated from the profile's noise by the GUM law of
 * propagation (JCGM 100:2008 §5.1.2), and its selection offset (the minimum of many noisy 3-point means lies
 * below the true level of a flat well; JCGM 101:2008 Monte Carlo). A value within −(offset + 3u) … 3u (coverage
 * factor k = 3: a site shows dozens of wafers, and a noise excursion should rarely be named a fault) is said to
 * be consistent with 0 at k = 3 — the measured value is still what the cell starts with; a value below that
 * range is named as more negative than the noise explains. Without an uncertainty (no noise estimate, or noise
 * correlated between points) the page says "uncertainty unknown" and why. When the noise came from the whole
 * profile rather than the well's interior, the text says so.
 */
import { formatNumber } from "../model/format.ts";

export interface WellGeMin {
  wellGeMin: number;
  wellGeMinStdErr?: number;
  wellGeMinOffset?: number;
  /** Why there is no uncertainty (depthProfile.ts), when there is none. */
  wellGeMinUnknown?: string;
  /** Where the noise estimate came from (depthProfile.ts). */
  geNoiseFrom?: "well" | "profile";
}

/** Coverage factor of the "consistent with zero" range (about 99.7 % for a normal distribution; module comment). */
const K = 3;

/** Where the minimum lies against zero: within its uncertainty of 0, above it, below it, or unknown (no uncertainty). */
export function wellGeMinAgainstZero(r: WellGeMin): "zero" | "above" | "below" | "no-uncertainty" {
  const u = r.wellGeMinStdErr;
  if (u === undefined || !(u > 0)) return "no-uncertainty";
  if (r.wellGeMin > K * u) return "above";
  if (r.wellGeMin < -((r.wellGeMinOffset ?? 0) + K * u)) return "below";
  return "zero";
}

/** The page text for the minimum Ge in the well (see module comment). */
export function wellGeMinText(r: WellGeMin): string {
  const v = formatNumber(r.wellGeMin, 3);
  const u = r.wellGeMinStdErr ?? NaN;
  const offset = r.wellGeMinOffset ?? 0;
  const measured = `${v} ± ${formatNumber(u, 2)}`;
  const afterOffset = offset > 0 ? ` after the selection offset ${formatNumber(offset, 2)}` : "";
  const source = r.geNoiseFrom === "profile" ? "; noise from the whole profile, the well's interior having too few points" : "";
  switch (wellGeMinAgainstZero(r)) {
    case "no-uncertainty":
      return `${v} (uncertainty unknown: ${r.wellGeMinUnknown ?? "the profile gives no noise estimate, most neighbouring points being equal"}${r.wellGeMin < 0 ? "; a Ge fraction below 0 points to the profile's background or calibration, or to the noise" : ""})`;
    case "above":
      return `${measured} (standard uncertainty${source})`;
    case "below":
      return `${measured} (standard uncertainty${source}): below 0 by more than the noise explains at k = ${K}${afterOffset} (the smallest of the well's 3-point means lies on average that far below a flat well's level); check the profile's background or calibration`;
    case "zero":
      return `${measured} (standard uncertainty; consistent with 0 at k = ${K}${afterOffset}${source})`;
  }
}

/**
 * The short form for the design-against-measured table: the measured value, its standard uncertainty and the
 * verdict against zero in a few words; the full text (wellGeMinText) stands once, in the profile's own table.
 */
export function wellGeMinBrief(r: WellGeMin): string {
  const v = formatNumber(r.wellGeMin, 3);
  const measured = `${v} ± ${formatNumber(r.wellGeMinStdErr ?? NaN, 2)}`;
  switch (wellGeMinAgainstZero(r)) {
    case "no-uncertainty":
      return `${v} (uncertainty unknown; see the profile's table)`;
    case "above":
      return measured;
    case "below":
      return `${measured} (below 0 beyond its noise at k = ${K}; see the profile's table)`;
    case "zero":
      return `${measured} (consistent with 0 at k = ${K})`;
  }
}
