/**
 * A PNG bomb: ~389 kB of deflated zeros that declare 20000 × 20000 greyscale
 * pixels (decoding them used to run past 5 minutes at 8.9 GB). The pixel
 * count is read from the IHDR header and refused above `max_image_pixels`
 * (default 4096 × 4096 = 16,777,216) before anything is decoded, with a
 * located error; the limit is an analysis setting (analysis.yaml or the
 * wafer's `analysis:` block).
 *
 * The PNG is written here from its specification (W3C PNG, 2nd ed., §5.2
 * signature, §5.3 chunk layout with CRC-32 over type and data, §11.2.2 IHDR,
 * §9 filter type 0 per scanline), not with the code under test.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { decodeMicrograph, MicrographFormatError } from "../../src/read/micrograph.ts";
import { loadWafer } from "../../src/validate/load/wafer.ts";
import { formatProblem } from "../../src/model/problem.ts";
import { applySettings, DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { problemMessage } from "../helpers/problems.ts";
import { HEALTHY_DIR } from "./corpus.ts";

function chunk(type: string, data: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, "latin1");
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(Buffer.concat([head.subarray(4), data])) >>> 0, 0);
  return Buffer.concat([head, data, crc]);
}

/** An all-black 8-bit greyscale PNG of width × height, deflated row block by row block (never holding the raw image). */
async function blackPng(width: number, height: number): Promise<Buffer> {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([8, 0, 0, 0, 0], 8); // bit depth 8, colour type 0 (grey), deflate, filter 0, no interlace
  const deflate = zlib.createDeflate({ level: 9 });
  const parts: Buffer[] = [];
  deflate.on("data", (c: Buffer) => parts.push(c));
  const done = new Promise((resolve) => deflate.on("end", resolve));
  const rows = 100;
  const block = Buffer.alloc((width + 1) * rows); // each scanline: filter byte 0, then the pixels
  for (let y = 0; y < height; y += rows) deflate.write(block.subarray(0, (width + 1) * Math.min(rows, height - y)));
  deflate.end();
  await done;
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", ihdr),
    chunk("IDAT", Buffer.concat(parts)),
    chunk("IEND", Buffer.alloc(0)),
  ]);
}

const tmps: string[] = [];
afterAll(async () => {
  for (const t of tmps) await fs.rm(t, { recursive: true, force: true });
});

/** The healthy wafer copied as `id` with one image entry naming images/<file> and an optional analysis block. */
async function waferWithImage(id: string, file: string, bytes: Buffer, analysis = ""): Promise<string> {
  const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-pixel-bomb-"));
  tmps.push(tmp);
  const data = path.join(tmp, "data");
  await fs.cp(HEALTHY_DIR, data, { recursive: true });
  const dir = path.join(data, "wafers", id);
  await fs.rename(path.join(data, "wafers", "OK-1"), dir);
  await fs.mkdir(path.join(dir, "images"));
  await fs.writeFile(path.join(dir, "images", file), bytes);
  const record = (await fs.readFile(path.join(dir, "wafer.md"), "utf8"))
    .replace("wafer: OK-1", `wafer: ${id}`)
    .replace("\n---\n\nNotes.", `\nimages:\n  - { file: images/${file}, pixel_nm: 0.05, kind: haadf, growth_axis: up }\n${analysis}---\n\nNotes.`);
  await fs.writeFile(path.join(dir, "wafer.md"), record);
  return data;
}

describe("a PNG that declares more pixels than max_image_pixels", () => {
  it("20000 × 20000 pixels in 389 kB: refused from the header, at once", async () => {
    const bomb = await blackPng(20000, 20000);
    expect(bomb.length).toBeLessThan(500_000);
    const t0 = performance.now();
    let err: unknown;
    try {
      decodeMicrograph(bomb);
    } catch (e) {
      err = e;
    }
    expect(performance.now() - t0).toBeLessThan(2000);
    expect(err).toBeInstanceOf(MicrographFormatError);
    expect((err as MicrographFormatError).found).toBe("20,000 × 20,000 = 400,000,000 pixels declared in the PNG header");

    const data = await waferWithImage("BIG-PNG", "bomb.png", bomb);
    const w = await loadWafer("BIG-PNG", { dataDir: data, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS });
    expect(w.problems.map(formatProblem)).toEqual([
      "wafers/BIG-PNG/images/bomb.png: images[0].file: micrograph too large (expected at most 16,777,216 pixels (the max_image_pixels setting), found 20,000 × 20,000 = 400,000,000 pixels declared in the PNG header) — Crop or downsample the micrograph, or raise max_image_pixels in analysis.yaml or the wafer's analysis: block (docs/formats.md, Limits). (listed in wafers/BIG-PNG/wafer.md line 8)",
    ]);
    expect(w.images).toEqual({});
  }, 20_000);

  it("the limit follows the setting: 300 × 300 pixels pass by default and are refused under max_image_pixels: 65536", async () => {
    const small = await blackPng(300, 300);
    expect(decodeMicrograph(small).width).toBe(300);
    const data = await waferWithImage("SMALL-PNG", "small.png", small, "analysis:\n  max_image_pixels: 65536\n");
    const w = await loadWafer("SMALL-PNG", { dataDir: data, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS });
    expect(w.problems.map((p) => [p.file, p.field, p.message, p.found])).toEqual([
      ["wafers/SMALL-PNG/images/small.png", "images[0].file", "micrograph too large", "300 × 300 = 90,000 pixels declared in the PNG header"],
    ]);
  }, 20_000);

  it("max_image_pixels is read like every setting, with its range", () => {
    expect(applySettings(DEFAULT_SETTINGS, { max_image_pixels: 5e7 }, { file: "analysis.yaml", field: "" }).max_image_pixels).toBe(5e7);
    expect(DEFAULT_SETTINGS.max_image_pixels).toBe(4096 * 4096);
    expect(problemMessage(() => applySettings(DEFAULT_SETTINGS, { max_image_pixels: 100 }, { file: "analysis.yaml", field: "", lineOf: () => 3 }))).toBe(
      "analysis.yaml:3: max_image_pixels: cannot read setting (largest micrograph accepted, width × height in pixels) (expected a number between 65536 and 1000000000, found 100) — see docs/formats.md, section Analysis settings",
    );
  });
});
