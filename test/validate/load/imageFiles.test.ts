import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { loadImageInputs } from "../../../src/validate/load/imageFiles.ts";
import type { WaferFileReader } from "../../../src/read/waferFiles.ts";
import { InputError, type Problem } from "../../../src/model/problem.ts";
import type { ImageSpec, WaferRecord } from "../../../src/validate/wafer.ts";
import { DEFAULT_SETTINGS } from "../../../src/validate/settings.ts";
import { micrographPng } from "../../../src/synth/micrographPng.ts";

/** A reader over in-memory files that records problems the way the real one does. */
function fakeReader(files: Record<string, Buffer>) {
  const problems: Omit<Problem, "wafer">[] = [];
  const reader: WaferFileReader = {
    wafer: "W1",
    recordFile: "wafers/W1/wafer.md",
    glob: () => [],
    readText: async () => {
      throw new Error("not used");
    },
    async readBytes(rel) {
      if (!(rel in files)) throw new InputError({ file: `wafers/W1/${rel}`, message: "file not found" });
      return { rel: `wafers/W1/${rel}`, bytes: files[rel] };
    },
    report: (p) => problems.push(p),
    async guard(fn) {
      try {
        return await fn();
      } catch (e) {
        if (e instanceof InputError) {
          problems.push(e.problem);
          return undefined;
        }
        throw e;
      }
    },
    lineOf: (field) => (field.startsWith("images[0]") ? 12 : field.startsWith("images[1]") ? 17 : undefined),
  };
  return { reader, problems };
}

const record = (images: ImageSpec[]) => ({ images, settings: DEFAULT_SETTINGS }) as unknown as WaferRecord;
const spec = (file: string, extra: Partial<ImageSpec> = {}): ImageSpec => ({ file, pixel_nm: 0.05, kind: "haadf", growth_axis: "up", ...extra });
const grey = micrographPng(
  Float32Array.from({ length: 64 * 48 }, (_, i) => (i % 7) / 7),
  64,
  48,
  8,
);

describe("loadImageInputs", () => {
  it("decodes a greyscale PNG into a micrograph input in SI units", async () => {
    const { reader, problems } = fakeReader({ "images/a.png": grey });
    const r = await loadImageInputs(record([spec("images/a.png", { reference: [0, 0, 32, 24] })]), reader);
    expect(problems).toEqual([]);
    expect(r.micrographs).toHaveLength(1);
    const m = r.micrographs![0];
    expect([m.width, m.height, m.file, m.index]).toEqual([64, 48, "wafers/W1/images/a.png", 0]);
    expect(m.pixelSize_m).toBeCloseTo(0.05e-9, 20);
    expect(m.reference).toEqual([0, 0, 32, 24]);
  });

  it("a non-PNG file → located error naming the file and images[i].file", async () => {
    const jpeg = Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0, 0x10, 0x4a, 0x46]);
    const { reader, problems } = fakeReader({ "images/a.jpg": jpeg, "images/b.png": grey });
    const r = await loadImageInputs(record([spec("images/a.jpg"), spec("images/b.png")]), reader);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ file: "wafers/W1/images/a.jpg", field: "images[0].file" });
    expect(problems[0].found).toMatch(/JPEG/);
    expect(problems[0].expected).toMatch(/greyscale image: PNG \(8- or 16-bit\) or TIFF/);
    expect(problems[0].fix).toMatch(/wafer\.md line 12/);
    expect(r.micrographs?.map((m) => m.index)).toEqual([1]); // the good image still loads
  });

  it("a colour PNG → located error naming the coloured pixel", async () => {
    const png = new PNG({ width: 4, height: 4 });
    png.data.fill(200);
    png.data[0] = 10; // pixel (0, 0) red differs from green and blue
    const { reader, problems } = fakeReader({ "images/c.png": PNG.sync.write(png, { colorType: 2 }) });
    const r = await loadImageInputs(record([spec("images/c.png")]), reader);
    expect(r.micrographs).toBeUndefined();
    expect(problems[0]).toMatchObject({ file: "wafers/W1/images/c.png", field: "images[0].file", message: "not a greyscale PNG micrograph" });
    expect(problems[0].found).toMatch(/colour image \(pixel \(0, 0\)/);
  });

  it("a reference rectangle outside the image → error at images[i].reference in wafer.md", async () => {
    const { reader, problems } = fakeReader({ "images/a.png": grey });
    await loadImageInputs(record([spec("images/a.png"), spec("images/a.png", { reference: [10, 10, 80, 40] })]), reader);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({
      file: "wafers/W1/wafer.md",
      line: 17,
      field: "images[1].reference",
      message: "reference rectangle lies outside the image",
    });
    expect(problems[0].expected).toMatch(/64×48/);
  });

  it("a reversed or tiny reference rectangle is refused", async () => {
    const { reader, problems } = fakeReader({ "images/a.png": grey });
    await loadImageInputs(record([spec("images/a.png", { reference: [30, 10, 20, 40] })]), reader);
    await loadImageInputs(record([spec("images/a.png", { reference: [0, 0, 8, 8] })]), reader);
    expect(problems.map((p) => p.message)).toEqual(["reference rectangle is empty or reversed", "reference rectangle is too small"]);
  });

  it("no images → empty inputs", async () => {
    const { reader } = fakeReader({});
    expect(await loadImageInputs(record([]), reader)).toEqual({});
  });
});
