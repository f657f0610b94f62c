/**
 * Is a composition depth profile sampled finely enough to resolve the well's
 * interfaces? The 10–90 % width of a logistic edge is measured from the points
 * that fall inside it; with fewer than `minPoints` depth steps across it the
 * fitted width is set by the sampling rather than by the interface, and is at
 * best an upper bound.
 *
 * Criterion (common practice for sampled edges; the threshold is ours): the
 * profile is too coarse when width10to90 / step < minPoints (default 3) for
 * either interface, where step is the median depth spacing of the profile.
 * Widths and step in the same unit (nm). Pure; never throws for data.
 */

export interface ProfileSampling {
  /** Median depth spacing, nm. */
  step: number;
  /** Depth steps across the narrower interface's 10–90 % width. */
  pointsAcross: number;
  coarse: boolean;
}

export const MIN_POINTS_ACROSS_INTERFACE = 3;

export function profileSampling(step: number, widths: readonly number[], minPoints = MIN_POINTS_ACROSS_INTERFACE): ProfileSampling {
  const narrowest = Math.min(...widths.filter((w) => Number.isFinite(w) && w > 0));
  const pointsAcross = step > 0 && Number.isFinite(narrowest) ? narrowest / step : Infinity;
  // A relative tolerance keeps an exact multiple (1.2 nm / 0.4 nm) from falling just short in floating point.
  return { step, pointsAcross, coarse: pointsAcross < minPoints * (1 - 1e-9) };
}
