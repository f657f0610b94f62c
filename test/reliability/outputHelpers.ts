/**
 * Helpers for the output-folder tests (outputGuard, outputSwap, inertRaw,
 * rawRetention, reproducible): a small data folder (the healthy fixture), a
 * tree hash that also records links and empty folders, and the CLI.
 */
import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { HEALTHY_DIR, ROOT } from "./corpus.ts";

export const BIN = path.join(ROOT, "bin", "waferbook.js");

/** A copy of the healthy fixture (one wafer, OK-1) at `dir`. */
export async function healthyData(dir: string): Promise<string> {
  await fs.cp(HEALTHY_DIR, dir, { recursive: true });
  return dir;
}

/** Every entry under `dir` (not following links) → the hash of its bytes, its link target, or "dir". */
export async function snapshot(dir: string): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  async function walk(rel: string): Promise<void> {
    for (const e of (await fs.readdir(path.join(dir, rel), { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const r = rel ? `${rel}/${e.name}` : e.name;
      const abs = path.join(dir, r);
      if (e.isSymbolicLink()) out.set(r, `link:${await fs.readlink(abs)}`);
      else if (e.isDirectory()) {
        out.set(r, "dir");
        await walk(r);
      } else
        out.set(
          r,
          createHash("sha256")
            .update(await fs.readFile(abs))
            .digest("hex"),
        );
    }
  }
  await walk("");
  return out;
}

/** The published site's files (following the top-level link) → SHA-256 of their bytes. */
export async function siteFiles(site: string): Promise<Map<string, string>> {
  const all = await snapshot(await fs.realpath(site));
  return new Map([...all].filter(([, v]) => v !== "dir"));
}

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `waferbook <args>` (optionally through a prefix such as setpriv) and returns its exit code and output. */
export async function cli(args: string[], opts: { cwd?: string; env?: Record<string, string>; prefix?: string[] } = {}): Promise<CliResult> {
  const argv = [...(opts.prefix ?? []), process.execPath, BIN, ...args];
  try {
    const r = await promisify(execFile)(argv[0], argv.slice(1), { cwd: opts.cwd ?? ROOT, env: { ...process.env, CI: "true", ...opts.env }, timeout: 120_000 });
    return { code: 0, stdout: r.stdout, stderr: r.stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

/** Script in data files: each, if it ever ran on the site, requests /__ran__?<kind> from the site itself. */
export const HOSTILE = {
  html: `<!doctype html><title>x</title><script>fetch("/__ran__?html");document.title="ran"</script>\n`,
  svg: `<svg xmlns="http://www.w3.org/2000/svg" onload="fetch('/__ran__?svg-onload')"><script>fetch("/__ran__?svg")</script></svg>\n`,
  xml: `<?xml version="1.0"?><html xmlns="http://www.w3.org/1999/xhtml"><script>fetch("/__ran__?xhtml")</script></html>\n`,
};

/**
 * The healthy fixture plus wafer EVIL-1, whose device pattern `transport/*`
 * also matches an .html, an .svg and an .xhtml file (none parses as a
 * sweep), whose images entry names the .svg, and whose notes embed a picture
 * from another site.
 */
export async function hostileData(dir: string): Promise<string> {
  await healthyData(dir);
  const w = path.join(dir, "wafers", "EVIL-1");
  await fs.cp(path.join(HEALTHY_DIR, "wafers", "OK-1", "transport"), path.join(w, "transport"), { recursive: true });
  await fs.writeFile(path.join(w, "transport", "evil.html"), HOSTILE.html);
  await fs.writeFile(path.join(w, "transport", "evil.svg"), HOSTILE.svg);
  await fs.writeFile(path.join(w, "transport", "evil.xhtml"), HOSTILE.xml);
  await fs.writeFile(
    path.join(w, "wafer.md"),
    `---
wafer: EVIL-1
run: R1
grown: 2024-05-03
devices:
  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/*" }
images:
  - { file: transport/evil.svg, pixel_nm: 0.05, kind: haadf, growth_axis: up }
---

Logo of the supplier: ![supplier logo](https://pictures.invalid/logo.png "their logo")
`,
  );
  return dir;
}
