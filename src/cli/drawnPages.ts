/**
 * Drawn wafer pages kept in the analysis cache folder, so a build that has
 * every wafer's analysis in the cache (the assembly after `--shard` builds,
 * docs/scaling.md) neither analyses nor draws: it renders.
 *
 * A drawn page is what drawWaferPage (waferPages.ts) leaves for rendering:
 * the page's pictures (PNG files under wafers/<id>/) and its parked model. It
 * is a pure function of the judged outcome and the drawing code — not of the
 * neighbours, breadcrumbs or history, which are added at rendering. Its key
 * is therefore the SHA-256 of DRAWN_FORMAT, the page code version
 * (pageReuse.ts pageCodeVersion: src/, templates/, runtime), the wafer's
 * analysis cache key (its files, settings and analysis code) and the judged
 * outcome without the analysis (record, values, judgement, problems,
 * provenance). A targets change changes the judgement, and so the key.
 *
 * Stored like the analysis entries (cache.ts): `<key[0:2]>/<key>.page.v8`,
 * header, SHA-256 of the payload, payload; written by temporary file and
 * rename; checked on every read, and a damaged file is deleted and the page
 * drawn again. So cache folders of several machines merge by plain copying.
 * The checksum detects damage, not authorship: a page that seals correctly
 * is also checked against what waferbook draws before it is published
 * (src/publish/drawnPageCheck.ts), and refused otherwise.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import { seal, unseal, writeAtomically } from "./cache.ts";
import { parkedPath } from "./render.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import { drawnFileProblem, pageModelProblem } from "../publish/drawnPageCheck.ts";

/** Bumped when the stored shape changes. */
const DRAWN_FORMAT = "waferbook-drawn-page-1";

interface DrawnPage {
  folder: string;
  /** The parked model's bytes (render.ts parkedPath). */
  model: Uint8Array;
  /** The page's pictures: path from the site root (wafers/<id>/…), bytes. */
  files: { path: string; bytes: Uint8Array }[];
}

/** The key of a drawn page (hex SHA-256); see the module comment. */
export function drawnPageKey(pageCode: string, cacheKey: string, outcome: WaferOutcome): string {
  return createHash("sha256")
    .update(`${DRAWN_FORMAT}\0${pageCode}\0${cacheKey}\0`)
    .update(JSON.stringify({ ...outcome, analysis: undefined }))
    .digest("hex");
}

export function drawnPagePath(cacheDir: string, key: string): string {
  return path.join(cacheDir, key.slice(0, 2), `${key}.page.v8`);
}

/** Every file under dir, paths relative to it with forward slashes; none when dir is missing. */
async function filesUnder(dir: string, rel = ""): Promise<string[]> {
  const entries = await fs.readdir(path.join(dir, rel), { withFileTypes: true }).catch(() => []);
  const out: string[] = [];
  for (const e of entries) {
    const r = rel ? `${rel}/${e.name}` : e.name;
    if (e.isDirectory()) out.push(...(await filesUnder(dir, r)));
    else if (e.isFile()) out.push(r);
  }
  return out.sort();
}

/**
 * Stores the page just drawn for `folder` (its pictures in outDir, its model
 * in scratchDir) under `key`. Failures to write are ignored, as for every
 * cache entry: the assembly then draws the page itself.
 */
export async function storeDrawnPage(cacheDir: string, key: string, folder: string, outDir: string, scratchDir: string): Promise<void> {
  const waferDir = path.join(outDir, "wafers", folder);
  const files = [];
  for (const rel of await filesUnder(waferDir)) files.push({ path: `wafers/${folder}/${rel}`, bytes: await fs.readFile(path.join(waferDir, rel)) });
  const page: DrawnPage = { folder, model: await fs.readFile(parkedPath(scratchDir, folder)), files };
  const dest = drawnPagePath(cacheDir, key);
  await fs.mkdir(path.dirname(dest), { recursive: true }).catch(() => {});
  await writeAtomically(dest, seal(v8.serialize(page)));
}

/** Whether a drawn page is stored under `key` (not checked: restoreDrawnPage checks it). */
export async function hasDrawnPage(cacheDir: string, key: string): Promise<boolean> {
  return fs.access(drawnPagePath(cacheDir, key)).then(
    () => true,
    () => false,
  );
}

/** What restoreDrawnPage found (see there). */
export type Restored = "restored" | "absent" | "damaged" | "refused";

/**
 * Puts the drawn page stored under `key` where drawWaferPage would have left
 * it (pictures into outDir, model into scratchDir): "restored"; "absent" when
 * there is none. A file that fails its checksum, or does not hold this
 * wafer's page, is deleted and reported to `onDamaged` ("damaged": the page
 * is then drawn from the analysis). A page that seals correctly but holds
 * anything waferbook's drawing never writes (src/publish/drawnPageCheck.ts:
 * markup, links, chart data and files checked against allow-lists) is
 * deleted and reported to `onRefused` with what was found ("refused"):
 * someone wrote it who could write into the cache, so the caller analyses
 * the wafer again from its raw files rather than trust its cache entry.
 * Nothing is written before the whole page has passed.
 */
export async function restoreDrawnPage(
  cacheDir: string,
  key: string,
  folder: string,
  outDir: string,
  scratchDir: string,
  onDamaged: (file: string, reason: string) => void,
  onRefused: (file: string, found: string) => void = onDamaged,
): Promise<Restored> {
  const file = drawnPagePath(cacheDir, key);
  let bytes: Buffer;
  try {
    bytes = await fs.readFile(file);
  } catch {
    return "absent";
  }
  const discard = async (reason: string, status: "damaged" | "refused") => {
    (status === "damaged" ? onDamaged : onRefused)(file, reason);
    await fs.rm(file, { force: true }).catch(() => {});
    return status;
  };
  const payload = unseal(bytes);
  if (typeof payload === "string") return discard(payload, "damaged");
  let page: DrawnPage;
  try {
    page = v8.deserialize(payload) as DrawnPage;
  } catch {
    return discard("its contents do not read as a drawn page", "damaged");
  }
  const prefix = `wafers/${folder}/`;
  if (
    page?.folder !== folder ||
    !(page.model instanceof Uint8Array) ||
    !Array.isArray(page.files) ||
    page.files.some(
      (f) =>
        typeof f?.path !== "string" ||
        !(f.bytes instanceof Uint8Array) ||
        !f.path.startsWith(prefix) ||
        f.path.split("/").some((p) => p === ".." || p === "" || p === "."),
    )
  ) {
    return discard("it does not hold this wafer's page", "damaged");
  }
  let refused: string | undefined;
  try {
    refused = checkDrawnPage(page, folder);
  } catch (e) {
    // A model nested deeper than the stack allows is not one waferbook drew.
    refused = `a page model that cannot be checked (${(e as Error).message})`;
  }
  if (refused) return discard(refused, "refused");
  for (const f of page.files) {
    const dest = path.join(outDir, ...f.path.split("/"));
    await fs.mkdir(path.dirname(dest), { recursive: true });
    await fs.writeFile(dest, f.bytes);
  }
  await fs.mkdir(scratchDir, { recursive: true });
  await fs.writeFile(parkedPath(scratchDir, folder), page.model);
  return "restored";
}

/** What a drawn page holds that waferbook's drawing never writes (src/publish/drawnPageCheck.ts), or undefined. */
function checkDrawnPage(page: DrawnPage, folder: string): string | undefined {
  for (const f of page.files) {
    const why = drawnFileProblem(f.path, f.bytes, folder);
    if (why) return why;
  }
  if (!page.files.some((f) => f.path === `wafers/${folder}/compare.js`)) return `no wafers/${folder}/compare.js, which every drawn page has`;
  let model: unknown;
  try {
    model = v8.deserialize(page.model);
  } catch {
    return "a page model that does not read back";
  }
  return pageModelProblem(model, folder);
}
