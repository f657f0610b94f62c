/**
 * Where the site keeps its copies of the raw files: one flat, content-addressed
 * folder, `raw/<SHA-256><extension>`. A link to a raw file therefore names the
 * exact bytes that were analysed — a link in an email keeps opening that file
 * even after the data change — identical files are stored once, file names
 * with URL-special characters (#, ?, %) need no escaping, and an unchanged
 * file is carried from one build to the next by a single hard link (no folder
 * tree to rebuild: see docs/scaling.md). Pages show the original path as the
 * link text and offer it as the download name.
 */

/** The copy's path from the site root, e.g. "raw/3b11…bb1.png" (lower-case extension of up to 10 letters or digits, else none). */
export function rawCopyPath(f: { path: string; sha256: string }): string {
  const m = /\.([A-Za-z0-9]{1,10})$/.exec(f.path);
  return `raw/${f.sha256}${m ? `.${m[1].toLowerCase()}` : ""}`;
}

/** The link to a raw file's copy from a wafer page (wafers/<id>/index.html). */
export function rawCopyHref(f: { path: string; sha256: string }): string {
  return `../../${rawCopyPath(f)}`;
}
