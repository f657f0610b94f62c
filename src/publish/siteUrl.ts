/**
 * Links between the site's pages, in one place for the templates (the `link`
 * filter, src/cli/render.ts), the page models that carry links (crumbs, trend
 * rows and chart points, the changes page) and the scripts (data-root on
 * <html>, read by assets/search.js).
 *
 * Two modes, chosen by the base path:
 * - "" (the default): every link is relative to the page that holds it and
 *   names a folder's index.html explicitly. The site then works opened from
 *   disk (file://, where a folder URL shows a file listing rather than its
 *   index.html) and on a web server under any path.
 * - a base path such as "/qual/" (`--base`): absolute links under that path,
 *   with tidy folder URLs (/qual/runs/R1/), for a web server.
 *
 * A link's target is a path from the site root without a leading slash: ""
 * (the wafer list), "runs/R1/", "assets/site.css", "targets/#trend-settings".
 * A page is named by its URL path as Eleventy gives it (page.url): "/",
 * "/wafers/TQ-2401/", "/trends/peak_mobility/". The relative prefix depends
 * only on that path, so a wafer page's links are the same in every build that
 * uses the same base path (page reuse, src/cli/pageReuse.ts, stays exact).
 */

/** "../" once per folder between the page and the site root: "" for "/", "../../" for "/wafers/TQ-2401/". */
export function relativeRoot(from: string): string {
  const parts = from.split(/[?#]/)[0].split("/").filter(Boolean);
  // "/a/b/" sits in folder a/b; "/a/page.html" sits in folder a.
  const depth = from.split(/[?#]/)[0].endsWith("/") ? parts.length : Math.max(0, parts.length - 1);
  return "../".repeat(depth);
}

/** What a link from page `from` to site path `target` reads as, for base path `basePath` ("" = relative). */
export function siteUrl(target: string, from: string, basePath: string): string {
  if (target.startsWith("/") || /^[a-z][a-z0-9+.-]*:/i.test(target)) throw new Error(`siteUrl: ${JSON.stringify(target)} is not a path from the site root`);
  if (basePath) return basePath + target;
  const cut = target.search(/[?#]/);
  const [file, rest] = cut < 0 ? [target, ""] : [target.slice(0, cut), target.slice(cut)];
  const named = file === "" || file.endsWith("/") ? `${file}index.html` : file;
  return relativeRoot(from) + named + rest;
}

/** The site root as seen from page `from`, for scripts that build links: "../" (relative) or the base path. */
export function siteRoot(from: string, basePath: string): string {
  return basePath || relativeRoot(from);
}
