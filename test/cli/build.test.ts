import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatSweep, hallSweepRows } from "../../src/synth/hallSweep.ts";
import { demoBuild, DEMO_HOOK_TIMEOUT_MS } from "../helpers/demoSite.ts";

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, "../..");
const bin = path.join(root, "bin", "waferbook.js");

async function waferbook(args: string[], cwd = root): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const r = await run(process.execPath, [bin, ...args], { cwd, env: { ...process.env, CI: "true" } });
    return { code: 0, stdout: r.stdout, stderr: r.stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

let tmp: string;
let out: string;
let first: { code: number; stdout: string; stderr: string };

// The demo build is the run's shared one (test/helpers/demoSite.ts: this same command line, once per run); only read here.
beforeAll(async () => {
  tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-cli-"));
  const demo = await demoBuild();
  out = demo.dir;
  first = demo;
}, DEMO_HOOK_TIMEOUT_MS);
afterAll(async () => {
  // Retries: a child build stopped by a time limit may still be removing its working folder.
  await fs.rm(tmp, { recursive: true, force: true, maxRetries: 5, retryDelay: 500 });
});

/** A wafer added by hand following docs/formats.md, built once with --strict (the last describe checks its figures). */
let hand: Promise<{ data: string; site: string; r: { code: number; stdout: string; stderr: string } }> | undefined;
function handSite() {
  hand ??= (async () => {
    const data = path.join(tmp, "hand");
    await fs.mkdir(path.join(data, "wafers", "HAND-1", "sweeps"), { recursive: true });
    await fs.writeFile(path.join(data, "targets.yaml"), 'default_grade: qubit\ngrades:\n  qubit:\n    peak_mobility: { min: "1.0e5 cm^2/(V s)" }\n');
    await fs.writeFile(
      path.join(data, "wafers", "HAND-1", "wafer.md"),
      `---\nwafer: HAND-1\nrun: R1\ngrown: 2025-01-15\ndevices:\n  - id: D1\n    geometry: hall-bar\n    length_um: 80\n    width_um: 20\n    files: "sweeps/*.csv"\n---\nHand-made record.\n`,
    );
    // Known truth: n = (1, 2, 3)e11 cm⁻², μ = (0.8, 1.5, 1.2)e5 cm²/Vs at Vg = 0.6, 0.8, 1.0 V.
    for (const [i, [vg, n, mu]] of HAND_TRUTH.entries()) {
      const rows = hallSweepRows({
        density: n,
        mobility: mu,
        geometry: "hall-bar",
        length_um: 80,
        width_um: 20,
        maxField: 0.5,
        points: 201,
        misalignment: 0.02,
        noise: 1e-4,
        seed: 100 + i,
      });
      await fs.writeFile(path.join(data, "wafers", "HAND-1", "sweeps", `g${i}.csv`), formatSweep({ gate: `${vg} V` }, rows, "\t"));
    }
    const site = path.join(tmp, "hand-site");
    return { data, site, r: await waferbook(["build", "--data", data, "--out", site, "--strict"]) };
  })();
  return hand;
}
const HAND_TRUTH = [
  [0.6, 1e15, 8],
  [0.8, 2e15, 15],
  [1.0, 3e15, 12],
];

describe("waferbook build on the demo data", () => {
  it("exits 0, prints one line per problem and a summary", () => {
    expect(first.code).toBe(0);
    expect(first.stdout).toMatch(/\d+ wafers \(.*\); \d+ input errors?, \d+ warnings?; [\d.]+ s/);
    expect(first.stderr).toMatch(/^wafers\/TQ-2404\/transport\/HB1\/vg_0p80V\.csv:141: column 3 \(Rxy\): cell is not a finite number/m);
    expect(first.stderr).not.toMatch(/\n\s+at /);
  });

  it("writes an index that links every wafer, and a page and results.json per wafer", async () => {
    const index = await fs.readFile(path.join(out, "index.html"), "utf8");
    const wafers = (await fs.readdir(path.join(root, "data", "wafers"))).sort();
    expect(wafers.length).toBeGreaterThanOrEqual(12);
    for (const w of wafers) {
      expect(index).toContain(`href="wafers/${w}/index.html"`);
      const page = await fs.readFile(path.join(out, "wafers", w, "index.html"), "utf8");
      expect(page).toContain(`Wafer ${w}`);
      const results = JSON.parse(await fs.readFile(path.join(out, "wafers", w, "results.json"), "utf8"));
      expect(Object.keys(results)).toEqual(expect.arrayContaining(["wafer", "run", "grown", "grade", "verdict", "metrics", "devices", "errors"]));
      expect(results.wafer).toBe(w);
      expect(["pass", "fail", "unjudged", "error", "marginal", "waived", "incomplete"]).toContain(results.verdict);
      for (const m of Object.values(results.metrics) as { value: unknown; unit: string; verdict: string }[]) {
        expect(typeof m.unit).toBe("string");
        expect(m.value === null || Number.isFinite(m.value)).toBe(true);
      }
      for (const d of results.devices) {
        for (const p of d.points) {
          expect(Object.keys(p)).toEqual(
            expect.arrayContaining(["gate_V", "density_per_cm2", "mobility_cm2_per_Vs", "sheet_resistance_ohm_per_sq", "hall_fit_r2"]),
          );
        }
      }
    }
    const pm = JSON.parse(await fs.readFile(path.join(out, "wafers", "TQ-2401", "results.json"), "utf8")).metrics.peak_mobility;
    expect(pm.unit).toBe("cm^2/(V s)");
    expect(pm.value).toBeGreaterThan(1e5);
  });

  it("gives the wafer with a broken file verdict error and its message, without touching the others", async () => {
    const broken = JSON.parse(await fs.readFile(path.join(out, "wafers", "TQ-2404", "results.json"), "utf8"));
    expect(broken.verdict).toBe("error");
    expect(broken.errors[0].text).toMatch(/vg_0p80V\.csv:141/);
    const page = await fs.readFile(path.join(out, "wafers", "TQ-2404", "index.html"), "utf8");
    expect(page).toContain("cell is not a finite number");
    const other = JSON.parse(await fs.readFile(path.join(out, "wafers", "TQ-2401", "results.json"), "utf8"));
    expect(other.verdict).not.toBe("error");
  });

  it("serves Chart.js from the site itself", async () => {
    await expect(fs.stat(path.join(out, "assets", "chart.umd.min.js"))).resolves.toBeTruthy();
    const page = await fs.readFile(path.join(out, "wafers", "TQ-2401", "index.html"), "utf8");
    expect(page).not.toMatch(/https?:\/\/(?!www\.w3\.org)/);
  });
});

describe("exit codes and the previous site", () => {
  it("--strict exits 1 when input errors were found", async () => {
    // The demo's broken wafer (TQ-2404) beside a healthy one without a micrograph (TQ-2402): the same input error as
    // in the full demo, at a fraction of the build.
    const data = path.join(tmp, "strict-data");
    await fs.cp(path.join(root, "data"), data, {
      recursive: true,
      filter: (src) => !src.includes(`${path.sep}wafers${path.sep}`) || ["TQ-2402", "TQ-2404"].some((w) => src.includes(`${path.sep}wafers${path.sep}${w}`)),
    });
    const r = await waferbook(["build", "--data", data, "--out", path.join(tmp, "strict"), "--strict"]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/--strict: 1 input error \(listed above\)/);
    expect(r.stderr).toMatch(/^wafers\/TQ-2404\/transport\/HB1\/vg_0p80V\.csv:141: column 3 \(Rxy\): cell is not a finite number/m);
  }, 600_000);
  it("bad usage exits 2 with a hint; --help explains every option", async () => {
    const r = await waferbook(["build", "--stirct"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('did you mean "--strict"?');
    const h = await waferbook(["--help"]);
    expect(h.code).toBe(0);
    for (const opt of ["--data", "--out", "--strict", "--base"]) expect(h.stdout).toContain(opt);
  });
  it("a build that cannot build leaves the previous output as it was", async () => {
    // The previous output is this file's own small site (the shared demo site is read by other files meanwhile).
    const { site, r: built } = await handSite();
    expect(built.code).toBe(0);
    const before = await fs.readFile(path.join(site, "index.html"), "utf8");
    const r = await waferbook(["build", "--data", path.join(tmp, "no-such-data"), "--out", site]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/data folder not found/);
    expect(await fs.readFile(path.join(site, "index.html"), "utf8")).toBe(before);
  }, 600_000);
});

describe("a wafer added by hand following docs/formats.md", () => {
  it("appears in the site with the right figures", async () => {
    const { site, r } = await handSite();
    expect(r.code).toBe(0);
    const res = JSON.parse(await fs.readFile(path.join(site, "wafers", "HAND-1", "results.json"), "utf8"));
    expect(res.metrics.peak_mobility.value).toBeCloseTo(1.5e5, -3);
    expect(res.metrics.peak_mobility.verdict).toBe("pass");
    expect(res.metrics.density_at_peak_mobility.value / 2e11).toBeCloseTo(1, 2);
    expect(res.metrics.gate_density_slope.value / 5e11).toBeCloseTo(1, 2);
    expect(res.metrics.turn_on_voltage.value).toBeCloseTo(0.4, 2);
    const index = await fs.readFile(path.join(site, "index.html"), "utf8");
    expect(index).toContain('href="wafers/HAND-1/index.html"');
  }, 600_000);
});
