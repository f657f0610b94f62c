/**
 * What the code version of the cache (cache.ts codeVersion) and of drawn pages
 * (pageReuse.ts pageCodeVersion) hash: the sources. A development checkout
 * hashes src/ as it runs; a compiled copy (dist/, made by scripts/bundle.mjs
 * when the package is packed or prepared, and the start-up bundles of a
 * checkout) carries the digests of the sources it was compiled from in
 * code-version.json beside it, since an installed package ships no src/.
 * Either way the same sources give the same digests, so a build through the
 * command and one through the sources share cache entries and page fingerprints.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { sha256File } from "./fileHashes.ts";
import { BUNDLED, SRC_DIR } from "./paths.ts";

/** Folders of src/ whose code decides what a cache entry holds. */
const ANALYSIS_FOLDERS = ["physics", "model", "read", "validate", "analyse"];
/** Files outside those folders that decide what a cache entry holds. */
const ANALYSIS_FILES = ["cli/analyseFolder.ts", "cli/cache.ts", "cli/lookUp.ts"];

export interface CodeDigests {
  /** SHA-256 (hex) of the sources of reading, validation, analysis and physics. */
  analysis: string;
  /** SHA-256 (hex) of every source file (everything that can change a drawn page). */
  drawing: string;
}

/** Every file under dir whose name passes `keep`, absolute paths (node's recursive readdir). */
export async function sourceFiles(dir: string, keep: (name: string) => boolean = (n) => n.endsWith(".ts")): Promise<string[]> {
  const entries = await fs.readdir(dir, { recursive: true, withFileTypes: true });
  return entries.filter((e) => e.isFile() && keep(e.name)).map((e) => path.join(e.parentPath, e.name));
}

/** SHA-256 (hex) of a salt and of each file's path (relative to root, with "/") and SHA-256, in sorted order (files streamed, never read whole). */
export async function hashFiles(salt: string, root: string, files: string[]): Promise<string> {
  const h = createHash("sha256").update(`${salt}\0`);
  const rel = files.map((f) => [path.relative(root, f).split(path.sep).join("/"), f] as const).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  for (const [name, f] of rel)
    h.update(name)
      .update("\0")
      .update(await sha256File(f))
      .update("\0");
  return h.digest("hex");
}

/** The digests of the sources under srcDir (what scripts/bundle.mjs writes into code-version.json). */
export async function sourceDigests(srcDir: string): Promise<CodeDigests> {
  const analysisFiles = [
    ...(await Promise.all(ANALYSIS_FOLDERS.map((f) => sourceFiles(path.join(srcDir, f))))).flat(),
    ...ANALYSIS_FILES.map((f) => path.join(srcDir, f)),
  ];
  return { analysis: await hashFiles("analysis", srcDir, analysisFiles), drawing: await hashFiles("drawing", srcDir, await sourceFiles(srcDir)) };
}

let digests: Promise<CodeDigests> | undefined;

/** The digests of the code that is running: code-version.json beside the compiled code, or src/ hashed now. */
export function codeDigests(): Promise<CodeDigests> {
  digests ??= BUNDLED ? fs.readFile(new URL("./code-version.json", import.meta.url), "utf8").then((s) => JSON.parse(s) as CodeDigests) : sourceDigests(SRC_DIR);
  return digests;
}
