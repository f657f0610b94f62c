// Builds demo data with --base /qual/ and checks every internal link; checks the export files' shape on the run's shared demo site.
// No published values: the expectations are this program's own URL and file layout (docs/publishing.md).
import { execFile } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { cp } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { parse as parseCsv } from "csv-parse/sync";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { commitAll } from "../helpers/gitRepo.ts";
import { build, PACKAGE_ROOT } from "../../src/cli/build.ts";
import { parseArgs } from "../../src/cli/args.ts";
import { demoSite, DEMO_HOOK_TIMEOUT_MS } from "../helpers/demoSite.ts";

const _git = promisify(execFile);
function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = path.join(dir, n);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
}

// Four demo wafers give every kind of page (images, structure, an input error, an incoherent well; as in incremental.test.ts),
// and with them every run, trend, target and changes page links: a --base build of the whole demo would check the same links again.
const WAFERS = ["TQ-2401", "TQ-2402", "TQ-2404", "TQ-2406"];

describe("site built with --base /qual/", () => {
  let root = "";
  let out = "";
  beforeAll(async () => {
    root = mkdtempSync(path.join(tmpdir(), "wb-links-"));
    out = path.join(root, "site");
    const data = path.join(root, "data");
    const sep = path.sep;
    await cp(path.join(PACKAGE_ROOT, "data"), data, {
      recursive: true,
      filter: (src) => !src.includes(`${sep}wafers${sep}`) || WAFERS.some((w) => src.includes(`${sep}wafers${sep}${w}`)),
    });
    // A history of its own, with a targets change, so the changes page and the wafers' histories have commits to link.
    await commitAll(data, "Demo data", { init: true });
    const targets = path.join(data, "targets.yaml");
    const text = readFileSync(targets, "utf8");
    const tightened = text.replace(/min: "1\.0e5 cm\^2\/\(V s\)"/, 'min: "1.5e5 cm^2/(V s)"');
    expect(tightened).not.toBe(text);
    writeFileSync(targets, tightened);
    await commitAll(data, "Tighter mobility target");
    const args = parseArgs(["build", "--data", data, "--out", out, "--base", "qual", "--quiet"]);
    if (args.command !== "build") throw new Error("bad args");
    const r = await build(args.options, { log: () => {}, today: () => "2026-01-01", now: () => "2026-01-01T00:00:00Z" });
    expect(r.ok).toBe(true);
    expect(r.outcomes.map((o) => o.folder).sort()).toEqual(WAFERS);
  }, 600_000);
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  it("every href/src is under /qual/, relative, an in-page anchor or a data: URL", () => {
    const pages = walk(out).filter((f) => f.endsWith(".html"));
    expect(pages.length).toBeGreaterThan(20);
    const bad: string[] = [];
    let checked = 0;
    for (const f of pages) {
      const html = readFileSync(f, "utf8");
      for (const m of html.matchAll(/\s(?:href|src)="([^"]*)"/g)) {
        const url = m[1];
        checked++;
        const ok = url.startsWith("/qual/") || url.startsWith("#") || url.startsWith("data:") || !/^([a-z][a-z0-9+.-]*:|\/)/i.test(url);
        if (!ok) bad.push(`${path.relative(out, f)}: ${url}`);
      }
    }
    expect(checked).toBeGreaterThan(500);
    expect(bad).toEqual([]);
  });

  it("every /qual/ link points at a file that exists in the output", () => {
    const missing = new Set<string>();
    for (const f of walk(out).filter((x) => x.endsWith(".html"))) {
      for (const m of readFileSync(f, "utf8").matchAll(/\s(?:href|src)="(\/qual\/[^"#]*)/g)) {
        let rel = m[1].slice("/qual/".length);
        if (rel === "" || rel.endsWith("/")) rel += "index.html";
        try {
          statSync(path.join(out, rel));
        } catch {
          missing.add(m[1]);
        }
      }
    }
    expect([...missing]).toEqual([]);
  });
});

describe("the demo site (the run's shared build): anchors and exports", () => {
  let out = "";
  beforeAll(async () => {
    out = await demoSite();
  }, DEMO_HOOK_TIMEOUT_MS);

  it("every section has an id (an anchor)", () => {
    for (const f of walk(out).filter((x) => x.endsWith(".html"))) {
      const html = readFileSync(f, "utf8");
      const sections = [...html.matchAll(/<section\b([^>]*)>/g)];
      for (const s of sections) expect(s[1], path.relative(out, f)).toMatch(/\bid="[^"]+"/);
    }
  });

  it("results.csv and results.json: one row per wafer, one column per metric with its unit", () => {
    // A real CSV reader: not-judged reasons are quoted cells with commas in them (RFC 4180).
    const csv: string[][] = parseCsv(readFileSync(path.join(out, "results.csv"), "utf8"));
    const header = csv[0];
    expect(header.slice(0, 6)).toEqual(["wafer", "run", "grown", "reactor", "grade", "verdict"]);
    expect(header).toContain("peak_mobility [cm^2/(V s)]");
    expect(header).toContain("peak_mobility_cv [%]");
    const wafers = readdirSync(path.join(PACKAGE_ROOT, "data", "wafers"));
    expect(csv.length - 1).toBe(wafers.length);
    for (const row of csv.slice(1)) expect(row.length).toBe(header.length);
    const json = JSON.parse(readFileSync(path.join(out, "results.json"), "utf8"));
    expect(json.wafers.length).toBe(wafers.length);
    expect(json.units.peak_mobility).toBe("cm^2/(V s)");
    expect(Object.keys(json.wafers[0].metrics)).toEqual(Object.keys(json.units));
    expect(json).toHaveProperty("dataCommit");
  });

  it("per-wafer points.csv and results.json with the wafer's and the targets' latest commits in provenance", () => {
    const dir = path.join(out, "wafers", "TQ-2403");
    const pts = readFileSync(path.join(dir, "points.csv"), "utf8").trimEnd().split("\r\n");
    expect(pts[0]).toBe("device,file,gate [V],density [cm^-2],mobility [cm^2/(V s)],sheet_resistance [ohm/sq],hall_fit_r2,hall_fit_poor,symmetrised");
    expect(pts.length).toBeGreaterThan(5);
    const r = JSON.parse(readFileSync(path.join(dir, "results.json"), "utf8"));
    expect(r.provenance).toHaveProperty("waferCommit");
    expect(r.provenance).toHaveProperty("targetsCommit");
  });
});
