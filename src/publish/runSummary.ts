/**
 * Run pages: each run's wafers aggregated per metric (mean, sample standard
 * deviation, min–max, n; src/analyse/uniformity.ts) and compared with the
 * previous run, ordered by the run's `started` date (run notes) or else its
 * first growth date.
 */
import { METRICS } from "../model/metrics.ts";
import { uniformity } from "../analyse/uniformity.ts";
import { formatNumber, formatValue } from "../model/format.ts";

export interface RunInput {
  id: string;
  /** `started` from the run notes, if recorded. */
  started?: string;
  wafers: { grown: string; values: Record<string, number | undefined> }[];
}

/** Sort key of a run: its start date, else its first growth date, else "~" (last). */
export function runDate(r: RunInput): string {
  const grown = r.wafers
    .map((w) => w.grown)
    .filter(Boolean)
    .sort()[0];
  return r.started ?? grown ?? "~";
}

/** Per run id: the previous run and a row per metric measured in the run. */
export function runComparisons(runs: readonly RunInput[]) {
  const ordered = [...runs].sort((a, b) => runDate(a).localeCompare(runDate(b)) || a.id.localeCompare(b.id));
  const out = new Map<string, { previous: string; rows: ReturnType<typeof rowsFor> }>();
  ordered.forEach((r, i) => {
    const prev = ordered[i - 1];
    out.set(r.id, { previous: prev?.id ?? "", rows: rowsFor(r, prev) });
  });
  return out;
}

function stats(r: RunInput | undefined, key: string) {
  const vs = (r?.wafers ?? []).map((w) => w.values[key]).filter((v): v is number => v !== undefined && Number.isFinite(v));
  return uniformity(vs);
}

function rowsFor(r: RunInput, prev: RunInput | undefined) {
  const rows = [];
  for (const spec of METRICS) {
    const u = stats(r, spec.key);
    if (!u.ok) continue;
    const p = stats(prev, spec.key);
    const change = p.ok ? u.mean - p.mean : undefined;
    const pct = p.ok && p.mean !== 0 ? (100 * (u.mean - p.mean)) / Math.abs(p.mean) : undefined;
    rows.push({
      key: spec.key,
      label: spec.label,
      n: String(u.n),
      mean: formatValue(u.mean, spec),
      sd: u.standardDeviation === null ? "—" : formatValue(u.standardDeviation, spec),
      range: u.n > 1 ? `${formatNumber(u.min, spec.digits)} … ${formatValue(u.max, spec)}` : "—",
      previousMean: p.ok ? formatValue(p.mean, spec) : "—",
      change:
        change === undefined
          ? "—"
          : `${change >= 0 ? "+" : "−"}${formatValue(Math.abs(change), spec)}${pct === undefined ? "" : ` (${pct >= 0 ? "+" : "−"}${formatNumber(Math.abs(pct), 2)} %)`}`,
    });
  }
  return rows;
}
