/**
 * The demo wafer kept in its instruments' own formats (TQ-2507: cryostat-logger
 * sweeps with a preamble, tabs, decimal commas, mT and kΩ, conditions in file
 * names; a 16-bit Deflate TIFF whose scale is in its resolution tags) must give
 * the same figures as the same data written in waferbook's own format and as a
 * PNG with pixel_nm — to 1e-9 relative (issue: raw files as instruments leave
 * them). The conversion below is the test's own, written from the file
 * descriptions in wafer.md; it shares no code with the reader.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { inflateSync } from "node:zlib";
import { loadSiteInputs } from "../../src/validate/load/site.ts";
import { loadWafer, type LoadedWafer } from "../../src/validate/load/wafer.ts";
import { analyseWafer } from "../../src/analyse/wafer.ts";
import { useTempDir } from "../helpers/tempDir.ts";

const ROOT = path.resolve(import.meta.dirname, "../..");
const ID = "TQ-2507";

/** The logger file as waferbook's format: "# key: value" lines, then name [unit] columns, decimal points. */
function toOwnFormat(name: string, text: string): string {
  const lines = text.split("\r\n");
  const meta: string[] = [];
  const gate = /Vg=([-0-9,]+)V/.exec(name);
  const field = /B=([-0-9,]+)T/.exec(name);
  if (gate) meta.push(`# gate: ${gate[1].replace(",", ".")} V`);
  if (field) meta.push(`# field: ${field[1].replace(",", ".")} T`);
  meta.push(`# temperature: ${lines[4].split("\t")[1].replace(",", ".")} K`, "# current: 10 nA");
  const header = lines[8].split("\t");
  const own: Record<string, string> = { "Field (mT)": "B [mT]", "Gate (V)": "Vg [V]", "R_xx (kOhm)": "Rxx [kohm]", "R_xy (kOhm)": "Rxy [kohm]" };
  const keep = header.map((h, i) => (own[h] ? i : -1)).filter((i) => i >= 0);
  const rows = lines
    .slice(9)
    .filter((l) => l !== "")
    .map((l) => keep.map((i) => l.split("\t")[i].replace(",", ".")).join(","));
  return [...meta, keep.map((i) => own[header[i]]).join(","), ...rows, ""].join("\n");
}

/** A 16-bit greyscale TIFF's samples, read from its strips by the TIFF 6.0 layout (little-endian, Deflate): this test's own reader. */
function tiffToPng(bytes: Buffer): Buffer {
  const u16 = (o: number) => bytes.readUInt16LE(o);
  const u32 = (o: number) => bytes.readUInt32LE(o);
  const ifd = u32(4);
  const tags = new Map<number, number[]>();
  for (let k = 0; k < u16(ifd); k++) {
    const at = ifd + 2 + 12 * k;
    const [tag, type, count] = [u16(at), u16(at + 2), u32(at + 4)];
    const size = type === 3 ? 2 : 4;
    const base = count * size > 4 ? u32(at + 8) : at + 8;
    tags.set(
      tag,
      Array.from({ length: type === 5 ? 2 * count : count }, (_, i) => (size === 2 ? u16(base + 2 * i) : u32(base + 4 * i))),
    );
  }
  const [w, h] = [tags.get(256)![0], tags.get(257)![0]];
  const raw = Buffer.concat(tags.get(273)!.map((off, i) => inflateSync(bytes.subarray(off, off + tags.get(279)![i]))));
  const png = new PNG({ width: w, height: h, colorType: 0, inputColorType: 0, bitDepth: 16 });
  const data = Buffer.alloc(2 * w * h);
  for (let i = 0; i < w * h; i++) data.writeUInt16LE(raw.readUInt16LE(2 * i), 2 * i); // pngjs takes 16-bit input in native (little-endian) order
  png.data = data;
  return PNG.sync.write(png, { colorType: 0, inputColorType: 0, bitDepth: 16 });
}

const tmp = useTempDir("instrument-twin");
const loaded: Record<"instrument" | "own", LoadedWafer | undefined> = { instrument: undefined, own: undefined };

async function copyTree(from: string, to: string, map: (rel: string, bytes: Buffer) => [string, Buffer | string] | undefined): Promise<void> {
  for (const e of await fs.readdir(from, { withFileTypes: true, recursive: true })) {
    if (!e.isFile()) continue;
    const abs = path.join(e.parentPath, e.name);
    const out = map(path.relative(from, abs), await fs.readFile(abs));
    if (!out) continue;
    await fs.mkdir(path.dirname(path.join(to, out[0])), { recursive: true });
    await fs.writeFile(path.join(to, out[0]), out[1]);
  }
}

beforeAll(async () => {
  const dir = tmp();
  const src = path.join(ROOT, "data", "wafers", ID);
  for (const [kind, data] of [
    ["instrument", "a"],
    ["own", "b"],
  ] as const) {
    const d = path.join(dir, data);
    await fs.mkdir(path.join(d, "wafers"), { recursive: true });
    for (const f of ["targets.yaml", "analysis.yaml"]) await fs.copyFile(path.join(ROOT, "data", f), path.join(d, f));
    await fs.cp(path.join(ROOT, "data", "runs"), path.join(d, "runs"), { recursive: true });
    await copyTree(src, path.join(d, "wafers", ID), (rel, bytes) => {
      if (kind === "instrument") return [rel, bytes];
      if (rel.endsWith(".dat")) return [rel.replace(/\.dat$/, ".csv"), toOwnFormat(path.basename(rel), bytes.toString("utf8"))];
      if (rel.endsWith(".tif")) return [rel.replace(/\.tif$/, ".png"), tiffToPng(bytes)];
      if (rel === "wafer.md") {
        // The same record without reading instructions: own-format files, and the scale written in.
        const md = bytes
          .toString("utf8")
          .replace(/\n {4}columns:[^\n]*(\n {6}[^\n]*)+\n {4}layout:[^\n]*\n {4}conditions:(\n {6}[^\n]*)+/g, "")
          .replace(/\*\.dat"/g, '*.csv"')
          .replace(/\.tif\n[^\n]*\n/, ".png\n    pixel_nm: 0.05\n");
        return [rel, md];
      }
      return [rel, bytes];
    });
    const site = await loadSiteInputs(d);
    loaded[kind] = await loadWafer(ID, { dataDir: d, today: "2026-12-02", siteSettings: site.settings, waferListing: [ID] });
  }
}, 120_000);

/** Every number in two result trees, side by side, with its path. */
function numbers(a: unknown, b: unknown, at: string, out: [string, number, number][]): void {
  if (typeof a === "number" && typeof b === "number") out.push([at, a, b]);
  else if (a && b && typeof a === "object" && typeof b === "object") {
    if (ArrayBuffer.isView(a)) a = Array.from(a as unknown as ArrayLike<number>);
    if (ArrayBuffer.isView(b)) b = Array.from(b as unknown as ArrayLike<number>);
    for (const k of Object.keys(a as object)) numbers((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${at}.${k}`, out);
  }
}

describe(`${ID}: instrument files give the figures of the same data in waferbook's format`, () => {
  it("both forms load without errors, and the instrument form notes its unmapped column", () => {
    const errs = (w?: LoadedWafer) => w!.problems.filter((p) => p.severity === "error");
    expect(errs(loaded.instrument)).toEqual([]);
    expect(errs(loaded.own)).toEqual([]);
    expect(loaded.instrument!.problems.some((p) => /ignored: "Temp \(K\)"/.test(p.message))).toBe(true);
    expect(loaded.instrument!.images.micrographs?.[0].pixelSizeSource).toBe("file");
  });
  it("every sweep, metric and figure agrees to 1e-9 relative", () => {
    const pairs: [string, number, number][] = [];
    // Images: the decoded pixels and scale are compared (identical inputs give identical image figures, and the image analysis is slow).
    const run = (w: LoadedWafer) =>
      analyseWafer(
        {
          devices: w.record!.devices.map((spec) => ({ spec, sweeps: w.devices.find((d) => d.id === spec.id)!.sweeps })),
          structure: w.structure,
          images: {},
          stack: w.record!.stack,
        },
        w.record!.settings,
      );
    const image = (w: LoadedWafer) => w.images.micrographs!.map((m) => ({ pixels: m.pixels, scale: m.pixelSize_m, w: m.width, h: m.height }));
    numbers(image(loaded.instrument!), image(loaded.own!), "images", pairs);
    numbers(
      loaded.instrument!.devices.map((d) =>
        d.sweeps.map((s) => ({ x: s.x, rxx: s.rxx, rxy: s.rxy, gate: s.gate_V, field: s.field_T, t: s.temperature_K, i: s.current_A })),
      ),
      loaded.own!.devices.map((d) =>
        d.sweeps.map((s) => ({ x: s.x, rxx: s.rxx, rxy: s.rxy, gate: s.gate_V, field: s.field_T, t: s.temperature_K, i: s.current_A })),
      ),
      "sweeps",
      pairs,
    );
    numbers(run(loaded.instrument!), run(loaded.own!), "analysis", pairs);
    expect(pairs.length).toBeGreaterThan(10_000);
    // The file line a condition was read from is provenance, not a figure: it differs between the two forms by design.
    const worst = pairs.filter(
      ([p, a, b]) =>
        !/\.conditions\.(\d+\.sources\.)?\d+\.line$/.test(p) &&
        !(a === b || (Number.isNaN(a) && Number.isNaN(b)) || Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b))),
    );
    expect(worst.slice(0, 5)).toEqual([]);
    const metrics = pairs.filter(([p]) => /\.metrics\./.test(p));
    expect(metrics.length).toBeGreaterThan(10);
  });
});
