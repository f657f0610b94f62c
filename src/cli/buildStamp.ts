/**
 * The build time the site-wide pages show in their footer ("Built … by
 * waferbook"), the one place a build's output depends on when it ran. When
 * SOURCE_DATE_EPOCH is set — the reproducible-builds convention
 * (https://reproducible-builds.org/specs/source-date-epoch/): a whole number of
 * seconds since 1970-01-01T00:00:00Z — that time is shown instead of the
 * clock's, so two builds of the same inputs are byte-identical. A malformed
 * value is refused (the specification asks builds to fail rather than guess).
 */

/** The latest second an ISO date can show with a four-digit year (9999-12-31T23:59:59Z). */
const LAST_SECOND = 253402300799;

/** "YYYY-MM-DDTHH:MM:SSZ" from SOURCE_DATE_EPOCH when set, else from the clock; `{ error }` for a malformed value. */
export function buildStamp(env: { SOURCE_DATE_EPOCH?: string }, clock: () => Date): { stamp: () => string } | { error: string } {
  const raw = env.SOURCE_DATE_EPOCH;
  const iso = (d: Date) => d.toISOString().replace(/\.\d+Z$/, "Z");
  if (raw === undefined || raw === "") return { stamp: () => iso(clock()) };
  if (!/^\d{1,12}$/.test(raw) || Number(raw) > LAST_SECOND) {
    return {
      error: `SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01T00:00:00Z (at most ${LAST_SECOND}), found ${JSON.stringify(raw.length > 40 ? `${raw.slice(0, 40)}…` : raw)}; unset it to show the build's own time`,
    };
  }
  const fixed = iso(new Date(Number(raw) * 1000));
  return { stamp: () => fixed };
}
