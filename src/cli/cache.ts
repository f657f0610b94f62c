/**
 * The content-addressed analysis cache. An entry holds everything a wafer
 * needs to be judged and published without reading its raw files again: the
 * validated record, the provenance of every file read, the problems found
 * while loading, and the analysis. It never holds verdicts: judging against
 * targets.yaml runs on every build, so a targets-only change re-judges from
 * the cache.
 *
 * Key = SHA-256 of
 *   - CACHE_FORMAT and the analysis code version (`codeVersion`: a hash of
 *     every source file under src/read, src/validate, src/analyse and
 *     src/physics (codeDigest.ts; an installed package carries that digest
 *     in dist/code-version.json) plus the package version, computed once per build — a code
 *     change invalidates the cache without anyone remembering to bump a
 *     number; changes to judging or publishing do not, since their output is
 *     never cached);
 *   - the effective site-wide settings (analysis.yaml after defaults; the
 *     wafer's own overrides are in wafer.md, hashed below);
 *   - the path and SHA-256 of every file in the wafer folder (wafer.md
 *     included), in sorted order. The files are read and hashed, never parsed,
 *     to compute the key (about 1 GB/s; see docs/scaling.md), through a
 *     bounded buffer (fileHashes.ts sha256File): memory does not grow with
 *     file size.
 * Value = ENTRY_MAGIC, the SHA-256 of the payload, then the payload: v8.serialize
 * of a `CacheEntry` (typed arrays survive). Written to a temporary file and
 * renamed into place, so a reader sees a whole entry or none, and concurrent
 * builds or CI runners sharing the folder cannot tear it. The checksum is
 * verified on every read: an entry whose bytes changed after it was written
 * (a flipped bit on disk or in transit, a truncated copy, a hand edit) is
 * discarded with a warning naming it and the wafer is analysed again, so the
 * cache can make a build slower but never change what it publishes.
 */
import { createHash } from "node:crypto";
import { lstatSync, promises as fs, readFileSync, readlinkSync, statSync } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import pLimit from "p-limit";
import { PACKAGE_ROOT } from "./paths.ts";
import { codeDigests } from "./codeDigest.ts";
import { WAFER_BULK, type WaferAnalysis } from "../analyse/wafer.ts";
import { emptyBulk } from "../analyse/bulk.ts";
import type { RawFileInfo } from "../validate/load/wafer.ts";
import type { Problem } from "../model/problem.ts";
import type { WaferRecord } from "../validate/wafer.ts";
import { listFiles } from "../read/dataFiles.ts";
import { sha256File, type FileHashes } from "./fileHashes.ts";

/** Bumped when the entry's shape changes. */
export const CACHE_FORMAT = "waferbook-cache-4";
/** The first bytes of every entry file (format and version of the file layout). */
const ENTRY_MAGIC = Buffer.from("WBCACHE\x04", "latin1");
const CHECKSUM_BYTES = 32;

export interface CacheEntry {
  folder: string;
  record?: WaferRecord;
  files: RawFileInfo[];
  problems: Problem[];
  analysis?: WaferAnalysis;
}

/** Hash of the analysis code (cache.ts header: codeDigest.ts) and the package version; hex SHA-256. */
export async function codeVersion(packageVersion: string): Promise<string> {
  return sha256(`${CACHE_FORMAT}\0${packageVersion}\0${runtimeVersion()}\0${(await codeDigests()).analysis}`);
}

/**
 * What else the results depend on besides our sources: the Node.js and zlib
 * versions (PNG bytes, number formatting) and the exact installed libraries
 * (package-lock.json: ours in a checkout; installed as a package, which ships
 * none, the nearest one above it — the lab repository's, which pins our
 * libraries too). Part of the cache key and of every page fingerprint.
 */
export function runtimeVersion(): string {
  let lock = "no-lockfile";
  for (let dir = PACKAGE_ROOT; ; dir = path.dirname(dir)) {
    try {
      lock = sha256(readFileSync(path.join(dir, "package-lock.json")));
      break;
    } catch {
      // none here: look further up (without any, the package version stands in)
    }
    if (path.dirname(dir) === dir) break;
  }
  return `node ${process.versions.node}, zlib ${process.versions.zlib}, lock ${lock}`;
}

/**
 * The cache key of one wafer folder (hex SHA-256); hashes its files (several
 * at a time, or takes unchanged files' hashes from `hashes`) without parsing
 * them. `digestsOut` receives each file's digest (path relative to the folder).
 */
export async function cacheKey(
  waferDir: string,
  code: string,
  siteSettings: unknown,
  hashes?: FileHashes,
  twins: string[] = [],
  digestsOut?: Map<string, string>,
): Promise<string> {
  const files = await listFiles(waferDir).catch(() => [] as string[]);
  const limit = pLimit(8);
  const digests = await Promise.all(files.map((rel) => limit(() => fileDigest(path.join(waferDir, rel), hashes))));
  files.forEach((rel, i) => digestsOut?.set(rel, digests[i]));
  // Folders whose names differ only in letter case make the wafer an error (read/wafer.ts), so they are part of the key.
  const h = createHash("sha256").update(`${code}\0${JSON.stringify(siteSettings)}\0${JSON.stringify(twins)}\0`);
  files.forEach((rel, i) => h.update(`${rel}\0${digests[i]}\0`));
  return h.digest("hex");
}

async function fileDigest(abs: string, hashes?: FileHashes): Promise<string> {
  try {
    // Synchronous: a cached stat takes microseconds, while the promise API's overhead per call is ~10× that (12,000 files at the benchmark's size).
    const st = lstatSync(abs);
    if (st.isSymbolicLink()) {
      // The loader follows links that stay inside the data folder, so the key follows them too: the link's text and its target's bytes.
      const target = statSync(abs);
      if (!target.isFile()) return `special:${target.mode}`;
      const bytes = hashes ? await hashes.sha256(abs, target) : await sha256File(abs);
      return `link:${readlinkSync(abs)}:${bytes}`;
    }
    if (!st.isFile()) return `special:${st.mode}`;
    return hashes ? await hashes.sha256(abs, st) : await sha256File(abs);
  } catch {
    // A file that vanished, a dangling link or a file that cannot be read: the loader will report it.
    return "unreadable";
  }
}

const sha256 = (bytes: Buffer | string) => createHash("sha256").update(bytes).digest("hex");

export function entryPath(cacheDir: string, key: string, form: EntryForm = "full"): string {
  return path.join(cacheDir, key.slice(0, 2), form === "full" ? `${key}.v8` : `${key}.slim.v8`);
}

/**
 * Which form of an entry: "full" holds everything the wafer's page draws;
 * "slim" (about a tenth of the size) holds the same record, problems,
 * provenance and every figure, without the bulk arrays (traces, map points,
 * spectra, image pixels and strain maps: see `slimAnalysis`). Judging,
 * results.json, the exports, the search index and every site-wide page read
 * only the slim form, so a wafer whose page is reused is never loaded in full.
 */
export type EntryForm = "full" | "slim";

/**
 * The entry stored under key, or undefined. A missing or unreadable file is a
 * plain miss; a file whose layout or SHA-256 checksum is wrong, or whose
 * payload does not deserialise to an entry, is deleted and reported to
 * `onDamaged` (its path and what is wrong), then read as a miss.
 */
export async function readEntry(
  cacheDir: string,
  key: string,
  form: EntryForm = "full",
  onDamaged?: (file: string, reason: string) => void,
): Promise<CacheEntry | undefined> {
  const file = entryPath(cacheDir, key, form);
  let bytes: Buffer;
  try {
    bytes = await fs.readFile(file);
  } catch {
    return undefined;
  }
  const damaged = (reason: string) => {
    onDamaged?.(file, reason);
    return fs.rm(file, { force: true }).then(
      () => undefined,
      () => undefined,
    );
  };
  const payload = unseal(bytes);
  if (typeof payload === "string") return damaged(payload);
  try {
    const entry = v8.deserialize(payload) as CacheEntry;
    if (entry && typeof entry === "object" && typeof entry.folder === "string" && Array.isArray(entry.files) && Array.isArray(entry.problems)) return entry;
  } catch {
    // reported below
  }
  return damaged("its contents do not read as a cache entry");
}

/** The warning for a damaged entry that was discarded (the wafer is then analysed again). */
export function damagedEntryWarning(folder: string, file: string, reason: string): Problem {
  return {
    severity: "warning",
    file: `wafers/${folder}/wafer.md`,
    wafer: folder,
    message: `the analysis cache entry ${file} was damaged and has been discarded (${reason}); the wafer was analysed again from its raw files`,
    fix: "nothing to do for this build; if it recurs, check the disk holding the cache, or whatever copies the cache between machines",
  };
}

/**
 * The build-output warning for a drawn page refused as not waferbook's own
 * (drawnPages.ts restoreDrawnPage): names the cache file and what it held.
 */
export function refusedPageWarning(folder: string, file: string, found: string): Problem {
  return {
    severity: "warning",
    file: `wafers/${folder}/wafer.md`,
    wafer: folder,
    message: `the drawn page ${file} in the cache was refused and deleted: it holds what waferbook never draws, so it was written by someone who could write into the cache folder; the wafer was analysed again from its raw files, not taken from the cache, and its page drawn afresh`,
    expected: "a drawn page as waferbook writes it (docs/scaling.md, Trust)",
    found,
    fix: "find which job or copy put that file into the cache; merge only cache folders written by your own pipeline's jobs, or build with --no-cache",
  };
}

/**
 * Why an entry does not belong to the folder's files as they are now hashed,
 * or undefined when it does: every file the entry's analysis read (its
 * provenance SHA-256, taken from the bytes parsed) must have the digest the
 * key was made from. A file that changed between hashing and reading would
 * otherwise leave an entry describing other bytes than its key names.
 */
export function entryMismatch(entry: CacheEntry, folder: string, digests: ReadonlyMap<string, string>): string | undefined {
  const prefix = `wafers/${folder}/`;
  for (const f of entry.files) {
    if (!f.path.startsWith(prefix)) continue;
    const d = digests.get(f.path.slice(prefix.length));
    if (d !== f.sha256 && !d?.endsWith(`:${f.sha256}`)) return `it records ${f.path} with other bytes than the file holds now`;
  }
  return undefined;
}

/** Header (magic and SHA-256 of the payload) and payload of an entry file. */
function entryBytes(entry: CacheEntry): Buffer {
  return seal(v8.serialize(entry));
}

/** A cache file's bytes: ENTRY_MAGIC, the SHA-256 of the payload, the payload. */
export function seal(payload: Buffer): Buffer {
  return Buffer.concat([ENTRY_MAGIC, createHash("sha256").update(payload).digest(), payload]);
}

/** The payload of a cache file written by `seal`, or what is wrong with it (a string) when the header or checksum does not match. */
export function unseal(bytes: Buffer): Buffer | string {
  const head = ENTRY_MAGIC.length + CHECKSUM_BYTES;
  if (bytes.length < head || !bytes.subarray(0, ENTRY_MAGIC.length).equals(ENTRY_MAGIC))
    return `not a waferbook cache entry of this version (${bytes.length} bytes, unexpected header)`;
  const payload = bytes.subarray(head);
  if (!createHash("sha256").update(payload).digest().equals(bytes.subarray(ENTRY_MAGIC.length, head)))
    return "its SHA-256 checksum does not match its contents";
  return payload;
}

/**
 * Stores an entry atomically (temporary file + rename), in both forms; the
 * slim form is written only once the full form is in place, and a reader
 * looks for it first, so a slim hit implies a complete full form beside it
 * (unless deleted by hand: then the full read misses and the wafer is
 * analysed again). Failures to write are
 * ignored: the cache is an optimisation.
 */
export async function writeEntry(cacheDir: string, key: string, entry: CacheEntry, slim = entry.analysis && slimAnalysis(entry.analysis)): Promise<void> {
  await fs.mkdir(path.dirname(entryPath(cacheDir, key)), { recursive: true }).catch(() => {});
  if (await writeAtomically(entryPath(cacheDir, key, "full"), entryBytes(entry))) {
    await writeAtomically(entryPath(cacheDir, key, "slim"), entryBytes({ ...entry, analysis: slim }));
  }
}

/** Writes a file by temporary name and rename; false (and nothing left behind) if that failed. */
export async function writeAtomically(dest: string, bytes: Buffer): Promise<boolean> {
  const tmp = `${dest}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
  try {
    await fs.writeFile(tmp, bytes);
    await fs.rename(tmp, dest);
    return true;
  } catch {
    await fs.rm(tmp, { force: true }).catch(() => {});
    return false;
  }
}

/**
 * The analysis without its bulk arrays: every typed array (traces, image pixels, strain maps)
 * becomes an empty one of the same kind, and the plain arrays each analysis lists as bulk at its
 * source (WAFER_BULK, src/analyse/bulk.ts: SdH traces and spectra, fit curves, gate-sweep columns
 * other than the gate voltage, depth-profile columns, the valley prediction's layer weights and E_v
 * distribution) become empty, XRD map points dropped. Every
 * scalar figure, fit, reason and per-point result is kept, so judging and every site-wide output
 * give the same result from either form (test/cli/slimEntry.test.ts).
 */
export function slimAnalysis(analysis: WaferAnalysis): WaferAnalysis {
  const slim = emptyTypedArrays(analysis) as WaferAnalysis;
  emptyBulk(slim, WAFER_BULK);
  return slim;
}

/** A copy of x in which every typed array is an empty one of the same kind. */
function emptyTypedArrays(x: unknown): unknown {
  if (ArrayBuffer.isView(x)) return new (x.constructor as new (n: number) => ArrayBufferView)(0);
  if (Array.isArray(x)) return x.map(emptyTypedArrays);
  if (x === null || typeof x !== "object") return x;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(x)) out[k] = emptyTypedArrays(v);
  return out;
}

/** The default cache folder: `.waferbook-cache/` beside the output folder. */
export function defaultCacheDir(outDir: string): string {
  return path.join(path.dirname(path.resolve(outDir)), ".waferbook-cache");
}
