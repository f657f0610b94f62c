/**
 * Reusing unchanged wafer pages from the previous output.
 *
 * A wafer's output folder (page, pictures, results.json, points.csv) is a pure
 * function of: the wafer's outcome (record, provenance with every file's
 * SHA-256, problems, metric values, judgement), what the page shows beside it
 * (previous/next wafer, breadcrumbs, history: see `waferPageExtras`), the
 * commits its results.json names, the base path, and the code that draws it
 * (all of src/, templates/, .eleventy.js and the package version). The page fingerprint is
 * the SHA-256 of exactly those inputs; it is written into the page as
 * `<meta name="waferbook-page" content="…">`. When the previous output holds a
 * page with the same fingerprint, its folder's files are hard-linked into the
 * new output instead of loading, drawing and rendering the page again. Nothing
 * build-specific (time stamp, repository HEAD) is on a wafer page, so a reused
 * page is byte-for-byte the page a fresh build would write (tested in
 * test/cli/incremental.test.ts).
 *
 * The analysis itself is not hashed: it is a deterministic function of the
 * files (hashed in the provenance), the settings (in the record) and the code
 * (hashed in the code version).
 */
import { createHash } from "node:crypto";
import { constants as fsConstants, copyFileSync, linkSync, mkdirSync, promises as fs, readdirSync } from "node:fs";
import path from "node:path";
import type { WaferOutcome } from "../judge/outcome.ts";
import { runtimeVersion } from "./cache.ts";
import { codeDigests, hashFiles, sourceFiles } from "./codeDigest.ts";
import { PACKAGE_ROOT } from "./paths.ts";

/** Bumped when the fingerprint's inputs change shape. */
const PAGE_FORMAT = "waferbook-page-1";

/** Hash of everything that draws a page: sources, templates, Eleventy configuration and package version. */
export async function pageCodeVersion(packageVersion: string): Promise<string> {
  const files = [...(await sourceFiles(path.join(PACKAGE_ROOT, "templates"), () => true)), path.join(PACKAGE_ROOT, ".eleventy.js")];
  return hashFiles(`${PAGE_FORMAT}\0${packageVersion}\0${runtimeVersion()}\0${(await codeDigests()).drawing}`, PACKAGE_ROOT, files);
}

/** The page fingerprint (hex SHA-256) of one wafer page. */
export function pageFingerprint(code: string, basePath: string, outcome: WaferOutcome, extras: unknown): string {
  const h = createHash("sha256").update(`${code}\0${basePath}\0`);
  h.update(JSON.stringify({ ...outcome, analysis: undefined }));
  h.update("\0");
  h.update(JSON.stringify(extras));
  return h.digest("hex");
}

const META = /<meta name="waferbook-page" content="([0-9a-f]{64})">/;

/** The fingerprint written in a previous page (index.html), or undefined when there is none. */
export async function previousFingerprint(pageFile: string): Promise<string | undefined> {
  let h: fs.FileHandle | undefined;
  try {
    h = await fs.open(pageFile, "r");
    const buf = Buffer.alloc(4096);
    const { bytesRead } = await h.read(buf, 0, buf.length, 0);
    return META.exec(buf.toString("utf8", 0, bytesRead))?.[1];
  } catch {
    return undefined;
  } finally {
    await h?.close();
  }
}

/**
 * Hard-links a reused page's folder (index.html, its pictures, results.json
 * and points.csv: all determined by the fingerprint) from the previous output
 * into the new one; its raw-file copies live in the site's raw/ folder and are
 * placed separately. Nothing may later write to a linked
 * path: that would change the previous output too. Falls back to copying
 * where links fail.
 */
export async function linkReusedPage(prevDir: string, newDir: string): Promise<void> {
  // Synchronous calls: thousands of small metadata operations, where the promise API's overhead per call dominates.
  mkdirSync(newDir, { recursive: true });
  // Node's recursive readdir lists a folder's entry (read from its parent) before the folder's own
  // entries, so each folder is made before anything inside it: a plain mkdir (the recursive form checks every ancestor).
  for (const e of readdirSync(prevDir, { recursive: true, withFileTypes: true })) {
    const r = path.relative(prevDir, path.join(e.parentPath, e.name));
    if (e.isDirectory()) mkdirSync(path.join(newDir, r));
    else if (e.isFile()) linkOrCopy(path.join(prevDir, r), path.join(newDir, r), { copy: true });
  }
}

/**
 * Hard-links `from` to `to` (a new name: never replaces an existing file, so
 * nothing is ever written through a link into the previous output). Where
 * links are not possible (another file system, not permitted, too many links)
 * copies instead when `copy`, else returns false; a missing `from` returns
 * false; anything else (an existing `to`) throws.
 */
export function linkOrCopy(from: string, to: string, { copy }: { copy: boolean }): boolean {
  try {
    linkSync(from, to);
    return true;
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === "ENOENT") return false;
    if (code !== "EXDEV" && code !== "EPERM" && code !== "EMLINK" && code !== "ENOTSUP") throw err;
    if (!copy) return false;
    copyFileSync(from, to, fsConstants.COPYFILE_EXCL);
    return true;
  }
}
