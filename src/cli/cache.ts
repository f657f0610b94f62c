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
 *     src/physics plus the package version, computed once per build — a code
 *     change invalidates the cache without anyone remembering to bump a
 *     number; changes to judging or publishing do not, since their output is
 *     never cached);
 *   - the effective site-wide settings (analysis.yaml after defaults; the
 *     wafer's own overrides are in wafer.md, hashed below);
 *   - the path and SHA-256 of every file in the wafer folder (wafer.md
 *     included), in sorted order. The files are read and hashed, never parsed,
 *     to compute the key (about 1 GB/s; see docs/scaling.md).
 * Value = v8.serialize of a `CacheEntry` (typed arrays survive), written to a
 * temporary file and renamed into place, so a reader sees a whole entry or
 * none, and concurrent builds or CI runners sharing the folder cannot tear it.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import { SRC_DIR } from "./paths.ts";
import type { WaferAnalysis } from "../analyse/wafer.ts";
import type { RawFileInfo } from "../read/wafer.ts";
import type { Problem } from "../validate/problem.ts";
import type { WaferRecord } from "../validate/wafer.ts";
import { listFiles } from "../read/dataFiles.ts";

/** Bumped when the entry's shape changes. */
export const CACHE_FORMAT = "waferbook-cache-2";

export interface CacheEntry {
  folder: string;
  record?: WaferRecord;
  files: RawFileInfo[];
  problems: Problem[];
  analysis?: WaferAnalysis;
}

const SRC = SRC_DIR;
const CODE_FOLDERS = ["read", "validate", "analyse", "physics"];
/** Files outside those folders that decide what a cache entry holds. */
const CODE_FILES = ["cli/analyseFolder.ts", "cli/cache.ts"];

async function sourceFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const e of await fs.readdir(dir, { withFileTypes: true })) {
    const abs = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...(await sourceFiles(abs)));
    else if (e.isFile() && e.name.endsWith(".ts")) out.push(abs);
  }
  return out;
}

/** Hash of the analysis code (sources of reading, validation, analysis, physics) and the package version; hex SHA-256. */
export async function codeVersion(packageVersion: string): Promise<string> {
  const h = createHash("sha256").update(`${CACHE_FORMAT}\0${packageVersion}\0`);
  const files = [...(await Promise.all(CODE_FOLDERS.map((f) => sourceFiles(path.join(SRC, f))))).flat(), ...CODE_FILES.map((f) => path.join(SRC, f))].sort();
  for (const f of files) h.update(path.relative(SRC, f)).update("\0").update(await fs.readFile(f)).update("\0");
  return h.digest("hex");
}


/** The cache key of one wafer folder (hex SHA-256); reads and hashes its files without parsing them. */
export async function cacheKey(waferDir: string, code: string, siteSettings: unknown): Promise<string> {
  const h = createHash("sha256").update(`${code}\0${JSON.stringify(siteSettings)}\0`);
  for (const rel of await listFiles(waferDir).catch(() => [] as string[])) {
    let digest = "unreadable";
    try {
      const st = await fs.lstat(path.join(waferDir, rel));
      digest = st.isFile() ? createHash("sha256").update(await fs.readFile(path.join(waferDir, rel))).digest("hex") : `special:${st.mode}`;
    } catch {
      // A file that vanished or cannot be read: the loader will report it.
    }
    h.update(`${rel}\0${digest}\0`);
  }
  return h.digest("hex");
}

function entryPath(cacheDir: string, key: string): string {
  return path.join(cacheDir, key.slice(0, 2), `${key}.v8`);
}

/** The entry stored under key, or undefined (missing or unreadable entries are misses). */
export async function readEntry(cacheDir: string, key: string): Promise<CacheEntry | undefined> {
  try {
    return v8.deserialize(await fs.readFile(entryPath(cacheDir, key))) as CacheEntry;
  } catch {
    return undefined;
  }
}

/** Stores an entry atomically (temporary file + rename). Failures to write are ignored: the cache is an optimisation. */
export async function writeEntry(cacheDir: string, key: string, entry: CacheEntry): Promise<void> {
  const dest = entryPath(cacheDir, key);
  const tmp = `${dest}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
  try {
    await fs.mkdir(path.dirname(dest), { recursive: true });
    await fs.writeFile(tmp, v8.serialize(entry));
    await fs.rename(tmp, dest);
  } catch {
    await fs.rm(tmp, { force: true }).catch(() => {});
  }
}

/** The default cache folder: `.waferbook-cache/` beside the output folder. */
export function defaultCacheDir(outDir: string): string {
  return path.join(path.dirname(path.resolve(outDir)), ".waferbook-cache");
}
