/**
 * Checks made before a build writes anything, so that the output folder can
 * never eat the input: --out may not be, hold or lie inside the data folder,
 * nor be or hold the git work tree that holds it, nor lie inside its .git
 * folder; --cache may not be, lie inside or hold the data folder; and a build
 * replaces only a folder that waferbook wrote (marked with SITE_MARKER, or a
 * site of an older version recognised by its layout). Paths are compared after
 * resolving symbolic links (for a path that does not exist yet, through its
 * nearest existing ancestor). Each refusal is an OutputRefusedError: one line
 * naming both paths, exit code 2, nothing written.
 */
import { constants as fsConstants, promises as fs } from "node:fs";
import path from "node:path";
import { BuildStoppedError } from "./outputFolder.ts";
import { isGenerationLink, SITE_MARKER } from "./siteLayout.ts";

/** The build was refused before anything was written (exit code 2). */
export class OutputRefusedError extends BuildStoppedError {}

/** What the top level of a site written by waferbook before the marker file existed may hold. */
const OLD_SITE_ENTRIES = new Set([
  "index.html",
  "wafers",
  "runs",
  "trends",
  "targets",
  "changes",
  "search",
  "raw",
  "assets",
  "results.csv",
  "results.json",
  "search-index.json",
  "compare",
  "relation",
]);

/** The real path of `p`: links resolved; for a path that does not exist yet, its nearest existing ancestor's real path with the rest appended. */
export async function resolveReal(p: string): Promise<string> {
  let head = path.resolve(p);
  const rest: string[] = [];
  for (;;) {
    try {
      return path.join(await fs.realpath(head), ...rest);
    } catch {
      const up = path.dirname(head);
      if (up === head) return path.resolve(p);
      rest.unshift(path.basename(head));
      head = up;
    }
  }
}

/** Whether `inner` is `outer` or lies inside it (both absolute and resolved). */
export function within(inner: string, outer: string): boolean {
  const rel = path.relative(outer, inner);
  return rel === "" || (rel !== ".." && !rel.startsWith(`..${path.sep}`) && !path.isAbsolute(rel));
}

/** The git work tree holding `dir` (the nearest ancestor-or-self with a .git entry), or null. */
async function workTreeOf(dir: string): Promise<string | null> {
  for (let d = dir; ; d = path.dirname(d)) {
    if (
      await fs.lstat(path.join(d, ".git")).then(
        () => true,
        () => false,
      )
    )
      return d;
    if (path.dirname(d) === d) return null;
  }
}

/** How `a` relates to folder `b`: "is", "lies inside", "holds", or null when apart. */
function relation(a: string, b: string): "is" | "lies inside" | "holds" | null {
  if (a === b) return "is";
  if (within(a, b)) return "lies inside";
  if (within(b, a)) return "holds";
  return null;
}

const shown = (given: string, real: string) => (path.resolve(given) === real ? real : `${path.resolve(given)} (resolved: ${real})`);
const CHOOSE = "the data folder is only ever read; choose an output folder outside it";

/**
 * Throws OutputRefusedError when building with these folders could write into
 * or over the data, or replace a folder waferbook did not write; also when the
 * output folder cannot be made (a file in the way, a parent that is not
 * writable). Reads only.
 */
export async function checkOutput(given: { data: string; out: string; cache: string | null }): Promise<void> {
  const data = await resolveReal(given.data);
  const outAbs = path.resolve(given.out);
  // Where the name itself lives, and where it leads (a link to a folder resolves to that folder).
  const outAt = path.join(await resolveReal(path.dirname(outAbs)), path.basename(outAbs));
  const outReal = await resolveReal(outAbs);
  const tree = await workTreeOf(data);
  for (const o of new Set([outAt, outReal])) {
    if (tree && tree !== data && within(tree, o))
      throw new OutputRefusedError(
        `refusing --out ${shown(given.out, o)}: it ${o === tree ? "is" : "holds"} the git work tree ${tree} that holds the data folder ${data}; ${CHOOSE}`,
      );
    if (tree && within(o, path.join(tree, ".git")))
      throw new OutputRefusedError(
        `refusing --out ${shown(given.out, o)}: it lies inside ${path.join(tree, ".git")}, the git folder of the data folder ${data}; ${CHOOSE}`,
      );
    const r = relation(o, data);
    if (r) throw new OutputRefusedError(`refusing --out ${shown(given.out, o)}: it ${r} the data folder ${data}; ${CHOOSE}`);
  }
  if (given.cache !== null) await checkCacheFolder(given.data, given.cache, given.cache);
  // The names a build works under beside --out (its lock, generations, building folders, links) are
  // removed or renamed by the build: the data or the cache must never be one of them, or inside one.
  for (const [what, given2, real] of [
    ["data folder", given.data, data],
    ...(given.cache !== null ? [["--cache", given.cache, await resolveReal(given.cache)]] : []),
  ] as [string, string, string][]) {
    const name = workingNameHolding(outAt, real);
    if (name)
      throw new OutputRefusedError(
        `refusing --out ${outAt}: the ${what} ${shown(given2, real)} is ${name === real ? "" : "inside "}${name}, a name the build uses for its own working files beside the output (lock, generations, building folders); rename the ${what} or choose another --out`,
      );
  }
  await checkOwnLock(outAbs);
  await checkOwnOutput(outAbs);
  await checkWritableParent(outAbs);
}

/** Refuses a cache folder that is, lies inside or holds the data folder (`shownAs`: the path as the user gave it). */
export async function checkCacheFolder(dataDir: string, cacheDir: string, shownAs: string): Promise<void> {
  const data = await resolveReal(dataDir);
  const cache = await resolveReal(cacheDir);
  const r = relation(cache, data);
  if (r)
    throw new OutputRefusedError(
      `refusing --cache ${shown(shownAs, cache)}: it ${r} the data folder ${data}; the data folder is only ever read — choose a cache folder outside it (or --no-cache)`,
    );
}

/**
 * The working name beside `out` (same parent folder) that is or holds `p`: `<out>.lock…` or
 * `.<out>-…` (generations, building folders, links: src/cli/siteLayout.ts), else null.
 */
function workingNameHolding(out: string, p: string): string | null {
  const parent = path.dirname(out);
  const base = path.basename(out);
  if (!within(p, parent) || p === parent) return null;
  const first = path.relative(parent, p).split(path.sep)[0];
  const ours = first === `${base}.lock` || first.startsWith(`${base}.lock.`) || first.startsWith(`.${base}-`);
  return ours ? path.join(parent, first) : null;
}

/** An existing `<out>.lock` must be a lock file a build wrote ("pid@host"): anything else is the user's, never removed. */
async function checkOwnLock(out: string): Promise<void> {
  const lock = `${out}.lock`;
  const st = await fs.lstat(lock).catch(() => null);
  if (!st) return;
  const text = st.isFile() && st.size < 1024 ? (await fs.readFile(lock, "utf8").catch(() => "")).trim() : "";
  if (!/^\d+(@\S*)?$/.test(text))
    throw new OutputRefusedError(
      `refusing --out ${out}: ${lock} exists and is not a lock a build wrote (expected a small file holding "pid@host"); move it away, or choose another --out`,
    );
}

/** The output folder, when it exists, must be one waferbook wrote. */
async function checkOwnOutput(out: string): Promise<void> {
  const st = await fs.lstat(out).catch(() => null);
  if (!st) return;
  if (st.isSymbolicLink()) {
    const target = await fs.readlink(out);
    if (isGenerationLink(out, target)) return;
    throw new OutputRefusedError(
      `refusing --out ${out}: it is a symbolic link to ${JSON.stringify(target)} that waferbook did not make; give the folder itself as --out, or remove the link`,
    );
  }
  if (!st.isDirectory()) throw new OutputRefusedError(`refusing --out ${out}: it is a file, not a folder; remove it or choose another --out`);
  const entries = await fs.readdir(out);
  if (entries.length === 0 || entries.includes(SITE_MARKER) || (await isOldSite(out, entries))) return;
  const some = entries
    .sort()
    .slice(0, 3)
    .map((e) => JSON.stringify(e.length > 40 ? `${e.slice(0, 40)}…` : e))
    .join(", ");
  throw new OutputRefusedError(
    `refusing --out ${out}: it is a folder that waferbook did not write (it holds ${some}${entries.length > 3 ? ", …" : ""} and no ${SITE_MARKER} marker); remove it or choose another --out`,
  );
}

/** A site written before the marker existed: only a site's own top-level names, and an index page waferbook built. */
async function isOldSite(out: string, entries: string[]): Promise<boolean> {
  if (!entries.includes("index.html") || !entries.every((e) => OLD_SITE_ENTRIES.has(e))) return false;
  const head = await fs.readFile(path.join(out, "index.html"), "utf8").catch(() => "");
  return / by waferbook \d/.test(head);
}

/** The output's nearest existing ancestor must be a folder this process may write in. */
async function checkWritableParent(out: string): Promise<void> {
  let d = path.dirname(out);
  while (
    !(await fs.lstat(d).then(
      () => true,
      () => false,
    )) &&
    path.dirname(d) !== d
  )
    d = path.dirname(d);
  const st = await fs.stat(d).catch(() => null);
  if (st && !st.isDirectory()) throw new OutputRefusedError(`refusing --out ${out}: ${d} is a file, not a folder; choose another --out`);
  const ok = await fs.access(d, fsConstants.W_OK | fsConstants.X_OK).then(
    () => true,
    () => false,
  );
  if (!ok)
    throw new OutputRefusedError(
      `refusing --out ${out}: ${d} is not writable, so the site (and its lock and temporary folder beside it) cannot be written there; choose another --out or fix the folder's permissions`,
    );
}
