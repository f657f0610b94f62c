/**
 * Shared outcome shape for transport analyses that may not be able to run.
 *
 * An analysis that cannot run for a data reason (too few points, no insulating
 * side, too few oscillation periods, ...) returns `{ ok: false, reason }` with the
 * reason in plain words; it throws only for programming errors.
 */
export interface Skipped {
  ok: false;
  /** Plain-words explanation of why the analysis did not run. */
  reason: string;
}

export function skipped(reason: string): Skipped {
  return { ok: false, reason };
}

/** True when every value is a finite number. */
export function allFinite(...values: number[]): boolean {
  return values.every((v) => Number.isFinite(v));
}
