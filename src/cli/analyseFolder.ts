/**
 * One wafer's read → validate → analyse step, with the analysis cache: the
 * part of the pipeline that depends only on the wafer's own files, its
 * settings and the code — never on targets. Runs in the main thread or in a
 * worker (src/cli/workerPool.ts); its result is plain data.
 */
import { analyseWafer, type WaferAnalysis } from "../analyse/wafer.ts";
import type { DeviceDepth } from "../analyse/transport/deviceDepth.ts";
import { lttbIndices } from "../analyse/numeric/lttb.ts";
import { loadWafer, type LoadContext } from "../validate/load/wafer.ts";
import { damagedEntryWarning, readEntry, slimAnalysis, writeEntry, type CacheEntry, type EntryForm } from "./cache.ts";
import type { Problem } from "../model/problem.ts";
import { lookUpFolder } from "./lookUp.ts";

export interface AnalyseContext extends LoadContext {
  /** Cache folder, or null to bypass the cache (--no-cache). */
  cacheDir: string | null;
  /** Analysis code version (cache.ts codeVersion). */
  code: string;
}

export interface AnalysedFolder {
  entry: CacheEntry;
  cacheHit: boolean;
  /** "slim" for a cache hit (bulk arrays left out: see cache.ts); "full" when just analysed or loaded in full. */
  form: EntryForm;
  /** The cache key, when the cache is in use. */
  key?: string;
  /** The slim form of a full result's analysis, when already made (for the cache). */
  slim?: WaferAnalysis;
  /** Warnings about the cache itself (a damaged entry discarded), for the build output; never stored in an entry. */
  warnings?: Problem[];
}

/**
 * The full form of a wafer's result (for drawing its page): read from the
 * cache under its key, or analysed again from the raw files if that form is
 * missing (or there is no cache).
 */
export async function loadInFull(folder: string, key: string | undefined, ctx: AnalyseContext): Promise<AnalysedFolder> {
  const warnings: Problem[] = [];
  const entry =
    ctx.cacheDir && key ? await readEntry(ctx.cacheDir, key, "full", (file, reason) => warnings.push(damagedEntryWarning(folder, file, reason))) : undefined;
  if (entry && entry.folder === folder) return { entry, cacheHit: true, form: "full", key };
  const fresh = await analyseFolder(folder, ctx, key);
  return warnings.length ? { ...fresh, warnings } : fresh;
}

/** Loads and analyses one wafer folder, or takes the result from the cache. `knownKey`: its cache key when already computed (and missed). */
export async function analyseFolder(folder: string, ctx: AnalyseContext, knownKey?: string): Promise<AnalysedFolder> {
  let key = knownKey;
  if (ctx.cacheDir && !key) {
    const found = await lookUpFolder(folder, ctx);
    if (found.hit) return found.hit;
    key = found.key;
    if (found.damaged) return { ...(await analyseFolder(folder, ctx, key)), warnings: [found.damaged] };
  }
  const loaded = await loadWafer(folder, ctx);
  let analysis: CacheEntry["analysis"];
  if (loaded.record) {
    const inputs = loaded.record.devices.map((spec) => ({ spec, sweeps: loaded.devices.find((d) => d.id === spec.id)?.sweeps ?? [] }));
    analysis = analyseWafer({ devices: inputs, structure: loaded.structure, images: loaded.images, stack: loaded.record.stack }, loaded.record.settings);
  }
  const entry: CacheEntry = {
    folder,
    record: loaded.record,
    files: loaded.files,
    problems: loaded.problems,
    analysis: analysis && keepForPublishing(analysis),
  };
  // Only wafers whose record validated are cached: a broken wafer.md is cheap to re-read, and its problems may depend on today's date.
  const slim = entry.analysis && slimAnalysis(entry.analysis);
  if (ctx.cacheDir && key && loaded.record) await writeEntry(ctx.cacheDir, key, entry, slim);
  return { entry, cacheHit: false, form: "full", key, slim };
}

/**
 * Drops what publishing never reads, so the build holds (and the cache
 * stores) less per wafer: the symmetrised traces of every field sweep except
 * each device's last one are cut to at most DISPLAY_TRACE_POINTS points (LTTB,
 * the union of the points kept for ρxx and for Rxy: enough for the page's
 * chart of every gate voltage; the page links the raw files for full
 * resolution), and the SdH traces and spectra of all but the charted point
 * go (slimDepth). Analysis results that were computed from the traces are kept.
 */
export function keepForPublishing(analysis: WaferAnalysis): WaferAnalysis {
  return {
    ...analysis,
    devices: analysis.devices.map((d) => ({
      ...d,
      points: d.points.map((p, i) => (i === d.points.length - 1 ? p : { ...p, trace: displayTrace(p.trace) })),
      depth: d.depth && slimDepth(d.depth),
    })),
  };
}

/** Points per channel kept of a field sweep that is only charted (publish/charts.ts draws at most 300). */
const DISPLAY_TRACE_POINTS = 300;

function displayTrace(t: { b: Float64Array; rhoxx: Float64Array; rxy: Float64Array }) {
  if (t.b.length <= DISPLAY_TRACE_POINTS) return t;
  const keep = [...new Set([...lttbIndices(t.b, t.rhoxx, DISPLAY_TRACE_POINTS), ...lttbIndices(t.b, t.rxy, DISPLAY_TRACE_POINTS / 3)])].sort((a, b) => a - b);
  const pick = (a: Float64Array) => Float64Array.from(keep, (i) => a[i]);
  return { b: pick(t.b), rhoxx: pick(t.rhoxx), rxy: pick(t.rxy) };
}

const NO_SDH_TRACE = { inverseField: [], oscillation: [] };
const NO_SPECTRUM = { frequency: [], amplitude: [] };

/**
 * The Shubnikov–de Haas oscillation trace and spectrum are charted for one
 * point per device only, the last with an SdH result; the other points keep
 * their SdH figures but not those arrays (about 35 kB per point).
 */
function slimDepth(depth: DeviceDepth): DeviceDepth {
  let charted = -1;
  depth.points.forEach((p, i) => {
    if (p.sdh.ok) charted = i;
  });
  return {
    ...depth,
    points: depth.points.map((p, i) => (i === charted || !p.sdh.ok ? p : { ...p, sdh: { ...p.sdh, trace: NO_SDH_TRACE, spectrum: NO_SPECTRUM } })),
  };
}
