/**
 * Bulk arrays: the traces, spectra, fitted curves and map points of an analysis that only the
 * wafer page's charts read. Each analysis names its own beside its result type, as paths
 * (property names; "*" for every element of an array), checked against that type by `fields`;
 * src/analyse/wafer.ts gathers them into WAFER_BULK, and the slim form of a cache entry
 * (slimAnalysis, src/cli/cache.ts) empties exactly those. Typed arrays (Float32Array,
 * Float64Array…) are bulk by their type and need no entry.
 */

/** One bulk array: where it is and whether the property is dropped (XRD map points) or emptied. */
export interface BulkPath {
  path: readonly string[];
  /** Set the property to undefined instead of an empty array. */
  drop?: boolean;
}

/** Bulk number arrays that are direct properties of a `T`, by name (the names are checked against T). */
export function fields<T>(...keys: (keyof T & string)[]): BulkPath[] {
  return keys.map((k) => ({ path: [k] }));
}

/** The paths `bulk` under `prefix`. */
export function under(prefix: readonly string[], bulk: readonly BulkPath[]): BulkPath[] {
  return bulk.map((b) => ({ ...b, path: [...prefix, ...b.path] }));
}

/**
 * Empties, in place, every array that `bulk` names in `x`: an array becomes [], or, with `drop`,
 * a non-empty one becomes undefined. Paths that lead nowhere in `x` (a skipped analysis) are passed over.
 */
export function emptyBulk(x: unknown, bulk: readonly BulkPath[]): void {
  for (const b of bulk) emptyAt(x, b, 0);
}

function emptyAt(x: unknown, b: BulkPath, i: number): void {
  if (x === null || typeof x !== "object") return;
  const key = b.path[i];
  if (key === "*") {
    if (Array.isArray(x)) for (const v of x) emptyAt(v, b, i + 1);
    return;
  }
  const obj = x as Record<string, unknown>;
  if (!Object.hasOwn(obj, key)) return;
  if (i < b.path.length - 1) {
    emptyAt(obj[key], b, i + 1);
    return;
  }
  const v = obj[key];
  if (!Array.isArray(v)) return;
  if (!b.drop) obj[key] = [];
  else if (v.length > 0) obj[key] = undefined;
}
