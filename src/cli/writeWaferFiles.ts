/**
 * The files of each wafer's output folder that are not rendered pages: its
 * results.json, its raw-file copies in the site's content-addressed raw/
 * folder, and the site's assets; a reused page's folder is linked from the
 * previous output as it is. raw/ is append-only: every raw object of the
 * previous site is carried over, so a link sent once keeps working after the
 * file it names was replaced (docs/publishing.md says how to prune).
 */
import { createHash } from "node:crypto";
import { constants as fsConstants, existsSync, promises as fs, readdirSync } from "node:fs";
import path from "node:path";
import pLimit from "p-limit";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { FileHashes } from "./fileHashes.ts";
import { BuildStoppedError } from "./outputFolder.ts";
import { linkOrCopy, linkReusedPage } from "./pageReuse.ts";
import { packageFile } from "./paths.ts";
import { RAW_OBJECT_NAME, rawCopyPath } from "../publish/rawCopies.ts";
import { resultsJson } from "../publish/resultsJson.ts";
import { openDataFile, readOpenFile, type OpenDataFile } from "../read/dataFiles.ts";
import { InputError } from "../model/problem.ts";

export type CommitsOf = (folder: string) => { wafer: string | null; targets: string | null };

/**
 * Writes each wafer's results.json and places its raw-file copies in the
 * site's content-addressed raw/ folder (src/publish/rawCopies.ts); a reused
 * page's folder is linked from the previous output as it is. Several wafers at
 * a time: this is file copies, links and small writes, mostly waiting on the
 * disk.
 */
export async function writeExtras(
  outcomes: WaferOutcome[],
  dataDir: string,
  tmpDir: string,
  commitsOf: CommitsOf,
  outDir: string,
  reused: ReadonlySet<string>,
  hashes: FileHashes | undefined,
): Promise<void> {
  await fs.mkdir(path.join(tmpDir, "raw"), { recursive: true });
  const placed = new Set<string>();
  const limit = pLimit(8);
  await Promise.all(
    outcomes.map((o) =>
      limit(async () => {
        const dir = path.join(tmpDir, "wafers", o.folder);
        if (reused.has(o.folder)) await linkReusedPage(path.join(outDir, "wafers", o.folder), dir);
        else {
          await fs.mkdir(dir, { recursive: true });
          await fs.writeFile(path.join(dir, "results.json"), JSON.stringify(resultsJson(o, commitsOf(o.folder)), null, 1) + "\n");
        }
        for (const f of o.provenance.files) {
          const parts = f.path.split("/");
          const rel = rawCopyPath(f);
          if (parts[0] !== "wafers" || parts[1] !== o.folder || placed.has(rel)) continue;
          placed.add(rel);
          await placeRawCopy(path.join(dataDir, ...parts), path.join(tmpDir, rel), path.join(outDir, rel), f.sha256, f.path, hashes, dataDir);
        }
      }),
    ),
  );
  carryOverRawObjects(path.join(outDir, "raw"), path.join(tmpDir, "raw"));
  const chartJs = packageFile("chart.js", "dist/chart.umd.min.js");
  await fs.mkdir(path.join(tmpDir, "assets"), { recursive: true });
  await fs.copyFile(chartJs, path.join(tmpDir, "assets", "chart.umd.min.js"));
}

/**
 * Puts a copy of a raw file into the new output. The copies are named by
 * their SHA-256, so a copy of that name in the previous output holds the same
 * bytes: it (ours, never the raw file) is hard-linked instead of copying the
 * bytes again. Otherwise the raw file is copied, and the copy must hold the
 * bytes that were analysed. The raw file is opened once, as the loader opens
 * it (dataFiles.ts openDataFile: inside the data folder, no link in its place,
 * the descriptor checked), and everything comes from that descriptor: when the
 * file-hash record vouches that the file is unchanged since it was hashed with
 * that SHA-256, a plain copy of the open file; else its bytes are read, checked
 * and written. A file that changed during the build stops the build (the
 * previous site stays).
 */
export async function placeRawCopy(
  rawAbs: string,
  dest: string,
  prevCopy: string,
  sha256: string,
  rel: string,
  hashes: FileHashes | undefined,
  dataDir = path.dirname(rawAbs),
): Promise<void> {
  if (linkOrCopy(prevCopy, dest, { copy: false })) return;
  const changed = () =>
    new BuildStoppedError(
      `${rel} changed while the site was being built (its bytes no longer match the SHA-256 that was analysed); build again once it is complete`,
    );
  let file: OpenDataFile;
  try {
    file = await openDataFile(dataDir, rawAbs);
  } catch (err) {
    if (err instanceof InputError) throw changed();
    throw err;
  }
  try {
    const { handle, stat } = file;
    if (hashes?.trusted(rawAbs, stat) === sha256 && existsSync(`/proc/self/fd/${handle.fd}`)) {
      // The open file itself, through its descriptor's /proc entry (Linux): a copy-on-write clone where the file system offers one (btrfs, XFS), else a plain copy.
      await fs.copyFile(`/proc/self/fd/${handle.fd}`, dest, fsConstants.COPYFILE_EXCL | fsConstants.COPYFILE_FICLONE);
      return;
    }
    const bytes = await readOpenFile(handle, stat.size);
    if (createHash("sha256").update(bytes).digest("hex") !== sha256) throw changed();
    await fs.writeFile(dest, bytes, { flag: "wx" });
  } finally {
    await file.handle.close();
  }
}

/**
 * Hard-links into the new raw/ folder every object of the previous one that
 * the new build did not place itself. Only regular files whose names this
 * version writes (`<SHA-256>.<inert extension or bin>`: RAW_OBJECT_NAME) are
 * carried: a copy an older version published under an active type (.html,
 * .svg) or without extension, or anything else found there, is left behind.
 * Returns how many were carried.
 */
export function carryOverRawObjects(prevRaw: string, newRaw: string): number {
  let entries: import("node:fs").Dirent[];
  try {
    entries = readdirSync(prevRaw, { withFileTypes: true });
  } catch {
    return 0; // no previous site, or one without raw files
  }
  const present = new Set(readdirSync(newRaw));
  let carried = 0;
  for (const e of entries) {
    if (!e.isFile() || !RAW_OBJECT_NAME.test(e.name) || present.has(e.name)) continue;
    if (linkOrCopy(path.join(prevRaw, e.name), path.join(newRaw, e.name), { copy: true })) carried++;
  }
  return carried;
}
