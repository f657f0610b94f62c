/**
 * How a site is published so that readers never find it missing or half
 * written (docs/publishing.md, "The output folder"):
 *
 *   site -> .site-gen-7/     the published site: a symbolic link (relative)
 *   .site-gen-7/             the current generation, a complete site
 *   .site-gen-6/             the previous one, kept until the next build so a
 *                            reader that resolved the old link can finish
 *   .site-building-<pid>/    a build in progress (never published as is)
 *
 * A build renders into `.site-building-<pid>`, renames the finished folder to
 * the next generation and then replaces the link with rename(2) of a new link
 * over it — atomic on POSIX file systems, so every open of `site/…` sees
 * either the old site or the new one, complete. Older generations are
 * removed afterwards; failing to remove one is a warning, never a failure.
 * A plain folder left by an older version is migrated once: renamed to a
 * generation and replaced by a link (the only moment, two system calls long,
 * when the name is absent).
 */
import { lstatSync, promises as fs } from "node:fs";
import path from "node:path";
import { BuildStoppedError } from "./outputFolder.ts";

/** The marker file at the top of every site waferbook writes: a build replaces only folders that carry it (src/cli/outputGuard.ts). */
export const SITE_MARKER = ".waferbook-site";
const MARKER_TEXT = "This folder is a site written by waferbook; a build may replace it (docs/publishing.md).\n";

const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
const genPattern = (base: string) => new RegExp(`^\\.${escapeRe(base)}-gen-(\\d{1,9})$`);
const genName = (base: string, n: number) => `.${base}-gen-${n}`;

/** Whether a link at `out` pointing at `target` is one this module made (a generation beside it). */
export function isGenerationLink(out: string, target: string): boolean {
  return genPattern(path.basename(out)).test(target);
}

interface Layout {
  parent: string;
  base: string;
  /** Generation numbers present (folders with the marker), ascending. */
  gens: number[];
  /** The highest number of any name shaped like a generation, marked or not (0 for none). */
  highest: number;
  /** The generation the link points at, or null (no link, a plain folder, or nothing). */
  current: number | null;
  kind: "missing" | "link" | "folder";
}

async function readLayout(outDir: string): Promise<Layout> {
  const parent = path.dirname(outDir);
  const base = path.basename(outDir);
  const re = genPattern(base);
  // Only folders that carry the marker are generations (a folder of the user's with a look-alike name is never touched).
  const named = (await fs.readdir(parent)).map((n) => re.exec(n)).filter((m) => m !== null);
  const gens = named
    .filter((m) => isMarkedFolder(path.join(parent, m[0])))
    .map((m) => Number(m[1]))
    .sort((a, b) => a - b);
  // New generations are numbered past every look-alike name too, so a publish never lands on one.
  const highest = Math.max(0, ...named.map((m) => Number(m[1])));
  const st = await fs.lstat(outDir).catch(() => null);
  if (!st) return { parent, base, gens, highest, current: null, kind: "missing" };
  if (!st.isSymbolicLink()) return { parent, base, gens, highest, current: null, kind: "folder" };
  const m = re.exec(await fs.readlink(outDir));
  return { parent, base, gens, highest, current: m ? Number(m[1]) : null, kind: "link" };
}

/** A real folder (not a link) holding the site marker: a site waferbook wrote. */
function isMarkedFolder(dir: string): boolean {
  try {
    return lstatSync(dir).isDirectory() && lstatSync(path.join(dir, SITE_MARKER)).isFile();
  } catch {
    return false;
  }
}

/** Points `outDir` at generation `n` atomically: a new link under a temporary name, renamed over the old one. */
async function pointAt(layout: Layout, n: number): Promise<void> {
  const tmp = path.join(layout.parent, `.${layout.base}-link-${process.pid}`);
  await fs.rm(tmp, { force: true });
  await fs.symlink(genName(layout.base, n), tmp);
  try {
    await fs.rename(tmp, path.join(layout.parent, layout.base));
  } catch (err) {
    await fs.rm(tmp, { force: true }).catch(() => {});
    throw err;
  }
}

/** Removes what is not `keep`: best effort, each failure a warning line. */
async function removeAll(parent: string, names: string[], warnings: string[]): Promise<void> {
  for (const n of names) {
    await fs.rm(path.join(parent, n), { recursive: true, force: true }).catch((err: NodeJS.ErrnoException) => {
      warnings.push(`could not remove ${path.join(parent, n)} (${err.code ?? err.message}); the site is not affected — remove it by hand`);
    });
  }
}

/** Generations neither current nor the newest one before it (kept for readers still on it). */
function stale(layout: Layout, current: number | null): string[] {
  const previous = layout.gens.filter((g) => current !== null && g < current).at(-1);
  return layout.gens.filter((g) => g !== current && g !== previous).map((g) => genName(layout.base, g));
}

/**
 * Run while holding the lock, before building. Puts back a site whose name
 * went missing (a build of an older version killed between its two renames
 * left it at `.<out>-building-<pid>-old`; a killed migration left it as a
 * generation), and removes what killed builds left: temporary folders and
 * links, and generations that were never published. Returns warnings.
 */
export async function recoverInterrupted(outDir: string): Promise<string[]> {
  const warnings: string[] = [];
  let layout = await readLayout(outDir);
  const prefix = `.${layout.base}-building-`;
  const names = await fs.readdir(layout.parent);
  const left = names.filter((n) => n.startsWith(prefix) && /^\d+(-old|-pages)?$/.test(n.slice(prefix.length)));
  const old = left.find((n) => n.endsWith("-old"));
  if (layout.kind === "missing" && old) await fs.rename(path.join(layout.parent, old), outDir);
  else if (layout.kind === "missing" && layout.gens.length > 0) await pointAt(layout, layout.gens.at(-1)!);
  layout = await readLayout(outDir);
  const links = names.filter((n) => n.startsWith(`.${layout.base}-link-`));
  await removeAll(layout.parent, [...left.filter((n) => n !== old || layout.kind !== "missing"), ...links], warnings);
  // Generations never published (newer than the link's); older ones are pruned after the next publish.
  await removeAll(
    layout.parent,
    layout.gens.filter((g) => layout.current !== null && g > layout.current).map((g) => genName(layout.base, g)),
    warnings,
  );
  return warnings;
}

/**
 * Publishes the finished site in `tmpDir` at `outDir` (see the module
 * comment). Throws BuildStoppedError with `previousKept` telling the truth
 * when publishing fails; returns warnings (old generations left behind).
 */
export async function publish(tmpDir: string, outDir: string): Promise<string[]> {
  await fs.writeFile(path.join(tmpDir, SITE_MARKER), MARKER_TEXT);
  let layout = await readLayout(outDir);
  if (layout.kind === "folder") layout = await migrate(layout, outDir);
  const next = Math.max(layout.gens.at(-1) ?? 0, layout.highest) + 1;
  const gen = path.join(layout.parent, genName(layout.base, next));
  try {
    await fs.rename(tmpDir, gen);
    await pointAt(layout, next);
  } catch (err) {
    await fs.rm(gen, { recursive: true, force: true }).catch(() => {});
    throw new BuildStoppedError(`could not publish the site at ${outDir} (${describe(err)})`);
  }
  const warnings: string[] = [];
  await removeAll(layout.parent, stale({ ...layout, gens: [...layout.gens, next] }, next), warnings);
  return warnings;
}

/** A plain folder (an older version's site, or an empty folder) becomes a generation behind a link. */
async function migrate(layout: Layout, outDir: string): Promise<Layout> {
  if ((await fs.readdir(outDir)).length === 0) {
    await fs.rmdir(outDir);
    return { ...layout, kind: "missing" };
  }
  const n = Math.max(layout.gens.at(-1) ?? 0, layout.highest) + 1;
  const gen = path.join(layout.parent, genName(layout.base, n));
  // The guard (outputGuard.ts) has recognised it as a site of ours: mark it, so it counts as a generation.
  await fs.writeFile(path.join(outDir, SITE_MARKER), MARKER_TEXT).catch(() => {});
  try {
    await fs.rename(outDir, gen);
  } catch (err) {
    throw new BuildStoppedError(`could not move the previous site ${outDir} aside to publish the new one (${describe(err)})`);
  }
  try {
    await pointAt(layout, n);
  } catch (err) {
    const back = await fs.rename(gen, outDir).then(
      () => true,
      () => false,
    );
    const e = new BuildStoppedError(
      back
        ? `could not publish the site at ${outDir} (${describe(err)})`
        : `could not publish the site at ${outDir} (${describe(err)}); the previous site is now at ${gen}: rename it back to ${outDir}`,
    );
    e.previousKept = back;
    throw e;
  }
  return { ...layout, gens: [...layout.gens, n], current: n, kind: "link" };
}

/** A system error in one line: its code and path, no stack. */
export function describe(err: unknown): string {
  const e = err as NodeJS.ErrnoException;
  return e.code ? `${e.code}${e.path ? ` on ${e.path}` : ""}` : String(e.message ?? e).split("\n")[0];
}
