/**
 * A wafer folder that is a symbolic link (a lab keeping raw data elsewhere on
 * a shared drive, say). It is followed when its target, after every link on
 * the way is resolved (realpath), is a folder inside the data folder that
 * does not hold the link itself; the wafer's files are then read through the
 * link with the usual checks (dataFiles.ts: each resolved path inside the
 * data folder, opened once with O_NOFOLLOW). Any other link is skipped, and
 * the reason is a located warning, never silence: a target outside the data
 * folder (refused like any path that leads out of it), a dangling link, a
 * loop of links, a link to a file, or a link to a folder that holds it.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import type { Problem } from "../model/problem.ts";

const INSIDE_FIX =
  "move the folder into the data folder (a link may point anywhere inside it, e.g. to raw/<wafer-id>), or mount the shared drive inside the data folder";

/** Is `real` the folder `root` or inside it (both resolved)? */
function within(root: string, real: string): boolean {
  const rel = path.relative(root, real);
  return rel === "" || !(rel === ".." || rel.startsWith(`..${path.sep}`) || path.isAbsolute(rel));
}

/** How a skipped link is reported: the warning for `file`, with what a followable link would be. */
type Skip = (why: string, found: string, fix: string) => Problem;

function skipper(file: string, expected: string): Skip {
  return (why, found, fix) => ({ severity: "warning", file, message: `symbolic link skipped: ${why}`, expected, found, fix });
}

/**
 * Resolves the link at `link` (every link on the way: realpath). Its target,
 * or the warning for a link that cannot be followed — a loop, dangling, or
 * unreadable — each with its own fix (`fixes`, for what the link should name).
 */
async function followLink(link: string, skipped: Skip, fixes: { loop: string; dangling: string }): Promise<{ target: string } | Problem> {
  const text = await fs.readlink(link).catch(() => "?");
  try {
    return { target: await fs.realpath(link) };
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === "ELOOP") return skipped("it is a loop of links", `a link to ${JSON.stringify(text)} that leads back to itself`, fixes.loop);
    if (code === "ENOENT") return skipped("it is dangling (its target does not exist)", `a link to ${JSON.stringify(text)}`, fixes.dangling);
    return skipped(`it cannot be followed (${code ?? String(err)})`, `a link to ${JSON.stringify(text)}`, "check the link and the permissions of its target");
  }
}

/**
 * Decides whether the link `wafers/<name>` is followed as a wafer folder:
 * null when it is, else the warning that names it and why it was skipped.
 */
export async function linkedWaferFolder(dataDir: string, name: string): Promise<Problem | null> {
  const file = `wafers/${name}`;
  const link = path.join(dataDir, "wafers", name);
  const skipped = skipper(file, "a folder, or a link to a folder inside the data folder");
  const followed = await followLink(link, skipped, {
    loop: "point the link at the wafer's folder itself",
    dangling: "point the link at an existing folder, or mount the drive it points to",
  });
  if (!("target" in followed)) return followed;
  const { target } = followed;
  const realData = await fs.realpath(dataDir);
  if (!within(realData, target)) return skipped("it leads outside the data folder", `a link to ${JSON.stringify(target)}`, INSIDE_FIX);
  const st = await fs.stat(target);
  if (!st.isDirectory())
    return skipped(
      "it leads to a file, not a folder",
      `a link to ${JSON.stringify(path.relative(realData, target).split(path.sep).join("/"))}`,
      "link the wafer's folder, not a file in it",
    );
  // A folder that holds the link (the data folder, wafers/ itself) would make the wafer contain itself.
  if (within(target, path.join(await fs.realpath(path.join(dataDir, "wafers")), name))) {
    return skipped(
      "it is a loop (it leads to a folder that holds the link)",
      `a link to ${JSON.stringify(path.relative(realData, target).split(path.sep).join("/") || ".")}`,
      "point the link at the wafer's own folder",
    );
  }
  return null;
}

/**
 * Decides whether a symbolic link found inside a wafer folder (`rel`, from
 * the data folder: wafers/<id>/…) is listed among the wafer's files: null when
 * it is — a link to a file, which is then read with the usual checks
 * (dataFiles.ts: refused with a located error if it leads outside the data
 * folder) — else the warning naming the link, where it points and why it is
 * skipped: a link to a folder (outside the data folder, refused like any path
 * that leads out of it; inside it, not followed, since a wafer's files are
 * the files in its own folder and the cache key hashes exactly those), a
 * dangling link, a loop of links. Without this, a pattern over the linked
 * folder only "matches no file".
 */
export async function linkInWaferFolder(dataDir: string, rel: string): Promise<Problem | null> {
  const link = path.join(dataDir, ...rel.split("/"));
  const skipped = skipper(rel, "a file, or a link to a file inside the data folder");
  const followed = await followLink(link, skipped, {
    loop: "replace the link by the file it should name",
    dangling: "point the link at an existing file, or mount the drive it points to",
  });
  if (!("target" in followed)) return followed;
  const { target } = followed;
  const st = await fs.stat(target).catch(() => null);
  if (!st?.isDirectory()) return null;
  const realData = await fs.realpath(dataDir);
  if (!within(realData, target))
    return skipped(
      "it leads to a folder outside the data folder, and no file is read from outside it",
      `a link to ${JSON.stringify(target)}`,
      "copy the files into the wafer folder; to keep a wafer's data elsewhere, make the whole wafer folder under wafers/ a link to a folder inside the data folder",
    );
  return skipped(
    "it leads to a folder, and links to folders inside a wafer folder are not followed (a wafer's files are those in its own folder)",
    `a link to ${JSON.stringify(path.relative(realData, target).split(path.sep).join("/") || ".")}`,
    "move or copy the files into the wafer folder, or link the files one by one",
  );
}
