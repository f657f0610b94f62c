/**
 * How a wafer page shows the minimum Ge fraction in the well (src/analyse/structure/depthProfile.ts): with its
 * standard uncertainty u, propagated from the profile's noise by the GUM law of propagation (JCGM 100:2008
 * §5.1.2), and its selection offset (the minimum of many noisy means lies below the true level of a flat well;
 * JCGM 101:2008 Monte Carlo). A value within −(offset + 3u) … 3u (coverage factor k = 3: a site shows dozens
 * of wafers, and a noise excursion should rarely be named a fault) is shown as consistent with zero, never as a
 * negative Ge fraction; a value below that range is named as more negative than the noise explains. Without a
 * noise estimate the page says that the value has no uncertainty, and why.
 */
import { formatNumber } from "../model/format.ts";

export interface WellGeMin {
  wellGeMin: number;
  wellGeMinStdErr?: number;
  wellGeMinOffset?: number;
}

/** Coverage factor of the "consistent with zero" range (about 99.7 % for a normal distribution; module comment). */
const K = 3;

/** Where the minimum lies against zero: within its uncertainty of 0, above it, below it, or unknown (no noise estimate). */
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
  const measured = `${v} ± ${formatNumber(u, 2)}`;
  const offset = `the smallest of many noisy points lies on average ${formatNumber(r.wellGeMinOffset ?? 0, 2)} below the true level of a flat well`;
  switch (wellGeMinAgainstZero(r)) {
    case "no-uncertainty":
      return `${v} (no uncertainty: the profile gives no noise estimate, most neighbouring points being equal${r.wellGeMin < 0 ? "; a Ge fraction below 0 points to the profile's background or calibration" : ""})`;
    case "above":
      return measured;
    case "below":
      return `${measured}: below 0 by more than the profile's noise explains (${offset}); check the profile's background or calibration`;
    case "zero":
      return r.wellGeMin < 0 ? `0 within its uncertainty (measured ${measured}; ${offset})` : `${measured} (consistent with 0)`;
  }
}
