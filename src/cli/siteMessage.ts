/**
 * The build's last line: where the site is and how to look at it. Without
 * --base every link is relative, so the site opens from disk; with --base its
 * links are absolute under that path and need a web server serving it there.
 */
import path from "node:path";

export function siteWrittenMessage(outDir: string, basePath: string): string {
  const index = path.join(outDir, "index.html");
  if (!basePath) return `site written to ${outDir}: open ${index} in a browser, or serve the folder with any static web server`;
  return `site written to ${outDir}: its links start with ${basePath}, so serve the folder at ${basePath} with a web server (opened from disk, its links would not resolve)`;
}
