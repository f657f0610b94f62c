/**
 * Where the site keeps its copies of the raw files: one flat, content-addressed
 * folder, `raw/<SHA-256><extension>`. A link to a raw file therefore names the
 * exact bytes that were analysed — a link in an email keeps opening that file
 * even after the data change — identical files are stored once, file names
 * with URL-special characters (#, ?, %) need no escaping, and an unchanged
 * file is carried from one build to the next by a single hard link (no folder
 * tree to rebuild: see docs/scaling.md). Pages show the original path as the
 * link text and offer it as the download name.
 *
 * A copy is never active content on the site's own origin: only extensions
 * that ordinary web servers serve with an inert type keep their name
 * (INERT_EXTENSIONS); every other file — .html, .svg, .xml, .js, no extension
 * … — is published as `raw/<SHA-256>.bin` (application/octet-stream: the
 * browser offers it as a download, whatever it holds). So a data file that
 * failed to parse can never be served as a page or a script.
 */

/**
 * Extensions published as they are: plain text and tables (txt, csv, tsv,
 * dat), Markdown records shown as text (md), and PNG images (decoded for the
 * analysis; an image type never runs script). Documented in docs/formats.md §7.
 */
export const INERT_EXTENSIONS: readonly string[] = ["csv", "tsv", "txt", "dat", "md", "png"];
/** The extension of every other copy. */
export const OPAQUE_EXTENSION = "bin";

/** A name in raw/ this version could have written: a SHA-256 and an inert or opaque extension. */
export const RAW_OBJECT_NAME = new RegExp(`^[0-9a-f]{64}\\.(${[...INERT_EXTENSIONS, OPAQUE_EXTENSION].join("|")})$`);

/** The copy's path from the site root, e.g. "raw/3b11…bb1.png": the file's lower-case extension when inert, else ".bin". */
export function rawCopyPath(f: { path: string; sha256: string }): string {
  const ext = /\.([A-Za-z0-9]{1,10})$/.exec(f.path)?.[1].toLowerCase();
  return `raw/${f.sha256}.${ext && INERT_EXTENSIONS.includes(ext) ? ext : OPAQUE_EXTENSION}`;
}

/** The link to a raw file's copy from a wafer page (wafers/<id>/index.html). */
export function rawCopyHref(f: { path: string; sha256: string }): string {
  return `../../${rawCopyPath(f)}`;
}
