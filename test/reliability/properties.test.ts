/**
 * Property-based tests (fast-check): random and mutated inputs to the sweep
 * parser (readTable + validateSweep), the record loader (readFrontMatter +
 * validateWafer), and the analysis entry points (analyseFieldSweep,
 * summariseDevice, analyseDeviceDepth, analyseStructure) never crash — the only throw allowed
 * is InputError, the only refusal `{ ok: false, reason }` — never hang (bounded
 * sizes, a time budget per property) and never put NaN or Infinity into a result.
 * Seeds are fixed so a failure reproduces.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { readTable } from "../../src/read/table.ts";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { validateSweep, type Sweep } from "../../src/validate/sweep.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { validateXrd } from "../../src/validate/xrd.ts";
import { validateDepthProfile } from "../../src/validate/depthProfile.ts";
import { InputError } from "../../src/model/problem.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { analyseFieldSweep, type TransportPoint } from "../../src/analyse/transport/fieldSweep.ts";
import { analyseDeviceDepth } from "../../src/analyse/transport/deviceDepth.ts";
import { summariseDevice } from "../../src/analyse/transport/deviceSummary.ts";
import { analyseStructure } from "../../src/analyse/structure/index.ts";
import { ROOT } from "./corpus.ts";

/** Total property runs asked for, logged after the last test. */
let totalRuns = 0;
afterAll(() => console.log(`property runs in total: ${totalRuns}`));
// A guard against a hang, not a speed limit: a property takes a few seconds on a quiet machine, and a
// busy 2-core machine can give this process a fifth of a core, so the budget sits just under the
// test's own time limit (vitest.config.ts, 180 s) and fast-check still names the run it reached.
const BUDGET_MS = 150_000;
const opts = (numRuns: number, seed: number) => {
  totalRuns += numRuns;
  return { numRuns, seed, interruptAfterTimeLimit: BUDGET_MS, markInterruptAsFailure: true };
};

/** Every number reachable from `value` is finite; returns the path of the first that is not. */
function firstNonFinite(value: unknown, where = "$", seen = new Set<unknown>()): string | undefined {
  if (typeof value === "number") return Number.isFinite(value) ? undefined : `${where} = ${value}`;
  if (value === null || typeof value !== "object" || seen.has(value)) return undefined;
  seen.add(value);
  if (ArrayBuffer.isView(value)) {
    const arr = value as unknown as ArrayLike<number>;
    for (let i = 0; i < arr.length; i++) if (!Number.isFinite(arr[i])) return `${where}[${i}] = ${arr[i]}`;
    return undefined;
  }
  for (const [k, v] of Object.entries(value)) {
    const bad = firstNonFinite(v, `${where}.${k}`, seen);
    if (bad) return bad;
  }
  return undefined;
}

function onlyInputErrors<T>(fn: () => T): T | undefined {
  try {
    return fn();
  } catch (e) {
    if (e instanceof InputError) {
      expect(e.problem.file).not.toBe("");
      expect(e.problem.message).not.toMatch(/NaN|undefined/);
      return undefined;
    }
    throw e;
  }
}

const demo = (rel: string) => readFileSync(path.join(ROOT, "data", "wafers", rel), "utf8");
const FIELD_SWEEPS = ["TQ-2401/transport/HB1/vg_0p80V.csv", "TQ-2402/transport/VDP1/vg_0p50V.csv"].map(demo);
const GATE_SWEEP = demo("TQ-2401/transport/HB1/gate_up.csv");
const HB = { geometry: "hall-bar" as const, length_um: 100, width_um: 20 };
const VDP = { geometry: "van-der-pauw" as const };

/** A cell value: ordinary, extreme, zero, or not a number at all. */
const cell = fc.oneof(
  fc.double({ noNaN: false, noDefaultInfinity: false }).map(String),
  fc.constantFrom("0", "-0", "1e308", "-1e308", "5e-324", "NaN", "Inf", "-Infinity", "", "OVLD", "1,5", '"', "0x10", " 7 "),
  fc.integer({ min: -3, max: 3 }).map(String),
);

/** Mutations of a text table: replace a cell, drop a line, duplicate a line, insert junk, swap two lines. */
const mutation = fc.oneof(
  fc.record({ kind: fc.constant("cell" as const), row: fc.nat(), col: fc.nat(4), value: cell }),
  fc.record({ kind: fc.constant("drop" as const), row: fc.nat() }),
  fc.record({ kind: fc.constant("dup" as const), row: fc.nat() }),
  fc.record({ kind: fc.constant("junk" as const), row: fc.nat(), text: fc.string({ maxLength: 30 }) }),
  fc.record({ kind: fc.constant("swap" as const), row: fc.nat(), other: fc.nat() }),
  fc.record({ kind: fc.constant("scale" as const), col: fc.nat(3), factor: fc.constantFrom(0, -1, 1e-12, 1e12, 1e200) }),
);

function mutate(text: string, ms: fc.Arbitrary<unknown> extends never ? never : Array<any>): string {
  const lines = text.split("\n");
  for (const m of ms) {
    const i = m.row !== undefined ? m.row % lines.length : 0;
    switch (m.kind) {
      case "cell": {
        const cells = lines[i].split(",");
        cells[m.col % cells.length] = m.value;
        lines[i] = cells.join(",");
        break;
      }
      case "drop":
        lines.splice(i, 1);
        break;
      case "dup":
        lines.splice(i, 0, lines[i]);
        break;
      case "junk":
        lines.splice(i, 0, m.text);
        break;
      case "swap": {
        const j = m.other % lines.length;
        [lines[i], lines[j]] = [lines[j], lines[i]];
        break;
      }
      case "scale":
        for (let r = 0; r < lines.length; r++) {
          if (!/^[-\d.]/.test(lines[r])) continue;
          const cells = lines[r].split(",");
          const c = m.col % cells.length;
          cells[c] = String(Number(cells[c]) * m.factor);
          lines[r] = cells.join(",");
        }
        break;
    }
    if (lines.length === 0) lines.push("");
  }
  return lines.join("\n");
}

function checkPoint(r: ReturnType<typeof analyseFieldSweep>): TransportPoint | undefined {
  if (!r.ok) {
    expect(typeof r.reason).toBe("string");
    expect(r.reason.length).toBeGreaterThan(0);
    return undefined;
  }
  expect(firstNonFinite(r.point)).toBeUndefined();
  return r.point;
}

describe("sweep parser and field-sweep analysis", () => {
  it("mutated demo sweeps: InputError or a finite sweep; analysis finite or a reason", () => {
    fc.assert(
      fc.property(fc.nat(FIELD_SWEEPS.length - 1), fc.array(mutation, { minLength: 1, maxLength: 6 }), (which, ms) => {
        const text = mutate(FIELD_SWEEPS[which], ms);
        const geometry = which === 0 ? HB : VDP;
        const sweep = onlyInputErrors(() => validateSweep(readTable(text, "f.csv"), geometry.geometry));
        if (!sweep) return;
        expect(firstNonFinite(sweep)).toBeUndefined();
        if (sweep.kind === "field") checkPoint(analyseFieldSweep(sweep, geometry, DEFAULT_SETTINGS));
      }),
      opts(400, 61),
    );
  }, 60_000);

  it("random small tables never crash the parser", () => {
    const line = fc.oneof(
      fc.constantFrom(
        "# gate: 0.5 V",
        "# field: 0 T",
        "# current: 10 nA",
        "# current: 0 A",
        "#",
        "B [T],Rxx [ohm],Rxy [ohm]",
        "Vg [V],Rxx [ohm],Rxy [ohm]",
        "B [T],Ra [ohm],Rb [ohm],Rxy [ohm]",
        "B [mT]\tVxx [uV]\tVxy [uV]\tI [nA]",
        "",
      ),
      fc.array(cell, { minLength: 1, maxLength: 5 }).map((c) => c.join(",")),
      fc.string({ maxLength: 40 }),
    );
    fc.assert(
      fc.property(fc.array(line, { maxLength: 30 }), fc.constantFrom("hall-bar", "van-der-pauw"), fc.constantFrom("\n", "\r\n"), (lines, geometry, eol) => {
        const sweep = onlyInputErrors(() => validateSweep(readTable(lines.join(eol), "r.csv"), geometry as "hall-bar"));
        if (!sweep) return;
        expect(firstNonFinite(sweep)).toBeUndefined();
        if (sweep.kind === "field") checkPoint(analyseFieldSweep(sweep, geometry === "hall-bar" ? HB : VDP, DEFAULT_SETTINGS));
      }),
      opts(1500, 62),
    );
  }, 60_000);
});

describe("device depth analysis", () => {
  it("random point sets and mutated gate sweeps: finite results or reasons", () => {
    const base = validateSweep(readTable(FIELD_SWEEPS[0], "a.csv"), "hall-bar");
    const p0 = checkPoint(analyseFieldSweep(base, HB, DEFAULT_SETTINGS))!;
    const point = fc.record({
      gate: fc.double({ min: -5, max: 5, noNaN: true }),
      n: fc.oneof(fc.double({ min: 1e12, max: 1e17, noNaN: true }), fc.constantFrom(p0.density, 1e-300, 1e300)),
      mu: fc.oneof(fc.double({ min: 1e-4, max: 1e3, noNaN: true }), fc.constant(p0.mobility)),
    });
    fc.assert(
      fc.property(fc.array(point, { maxLength: 12 }), fc.array(mutation, { maxLength: 4 }), fc.boolean(), (pts, ms, withGate) => {
        const points: TransportPoint[] = pts.map((q) => ({ ...p0, gate_V: q.gate, density: q.n, mobility: q.mu }));
        const gates: Sweep[] = [];
        if (withGate) {
          const g = onlyInputErrors(() => validateSweep(readTable(mutate(GATE_SWEEP, ms), "g.csv"), "hall-bar"));
          if (g && g.kind === "gate") gates.push(g);
        }
        const depth = analyseDeviceDepth(
          points.sort((a, b) => a.gate_V - b.gate_V),
          gates,
          DEFAULT_SETTINGS,
          HB,
        );
        expect(firstNonFinite(depth)).toBeUndefined();
        expect(firstNonFinite(summariseDevice(points))).toBeUndefined();
      }),
      opts(300, 63),
    );
  }, 90_000);
});

describe("record loader", () => {
  const record = demo("TQ-2401/wafer.md");
  it("mutated and random wafer.md: InputError or a typed record", () => {
    const text = fc.oneof(
      fc.array(mutation, { minLength: 1, maxLength: 5 }).map((ms) => mutate(record.replace(/, /g, ","), ms)),
      fc.string({ maxLength: 200 }).map((s) => `---\n${s}\n---\n`),
      fc
        .array(
          fc.constantFrom(
            "wafer: TQ-2401",
            "run: R1",
            "grown: 2024-01-01",
            "grown: 2999-01-01",
            "devices:",
            "  - id: A",
            "    geometry: hall-bar",
            '    files: "*.csv"',
            "stack: []",
            "images: [{}]",
            "analysis: { hall_max_field: 1 }",
            "key: [",
            "\t- x",
            'notes: "<script>"',
          ),
          { maxLength: 12 },
        )
        .map((ls) => `---\n${ls.join("\n")}\n---\nbody`),
    );
    fc.assert(
      fc.property(text, (t) => {
        const r = onlyInputErrors(() =>
          validateWafer(readFrontMatter(t, "wafers/TQ-2401/wafer.md"), {
            folder: "TQ-2401",
            file: "wafers/TQ-2401/wafer.md",
            today: "2025-06-01",
            siteSettings: DEFAULT_SETTINGS,
          }),
        );
        if (r) {
          expect(r.wafer).toBe("TQ-2401");
          expect(firstNonFinite(r.settings)).toBeUndefined();
        }
      }),
      opts(1500, 64),
    );
  }, 60_000);
});

describe("structure analysis", () => {
  const stack = validateWafer(readFrontMatter(demo("TQ-2401/wafer.md"), "w"), {
    folder: "TQ-2401",
    file: "w",
    today: "2025-06-01",
    siteSettings: DEFAULT_SETTINGS,
  }).stack;
  const names = stack.map((l) => l.name);
  const xrd = ["TQ-2401/xrd/rsm_224.csv", "TQ-2401/xrd/rsm_004.csv"].map(demo);
  const profile = demo("TQ-2401/profiles/sims.csv");
  it("mutated XRD maps and depth profiles: finite results or reasons", () => {
    fc.assert(
      fc.property(
        fc.array(mutation, { maxLength: 5 }),
        fc.array(mutation, { maxLength: 5 }),
        fc.array(mutation, { maxLength: 5 }),
        fc.boolean(),
        (m1, m2, m3, withStack) => {
          const x1 = onlyInputErrors(() => validateXrd(readTable(mutate(xrd[0], m1), "x1.csv"), names));
          const x2 = onlyInputErrors(() => validateXrd(readTable(mutate(xrd[1], m2), "x2.csv"), names));
          const p = onlyInputErrors(() => validateDepthProfile(readTable(mutate(profile, m3), "p.csv")));
          const inputs = { xrd: [x1, x2].filter((x) => x !== undefined), profiles: p ? [p] : [] };
          const result = analyseStructure(inputs, withStack ? stack : [], DEFAULT_SETTINGS);
          expect(firstNonFinite(result)).toBeUndefined();
        },
      ),
      opts(30, 65),
    );
  }, 180_000);
});
