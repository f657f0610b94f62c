/**
 * Demo cross-section micrographs (synthetic HAADF, invented): a <110>
 * cross-section of the Si well between Si0.7Ge0.3 barriers, drawn as a
 * centred lattice of atom columns (in-plane pitch a/√2, out-of-plane plane
 * spacing a/2) at 0.05 nm per pixel, 512 pixels (25.6 nm) along growth. The
 * coherent wells take the out-of-plane spacing of a Si layer strained to the
 * barrier (Dismukes' law, D = 2C12/C11: −2.006 % vs the barrier); TQ-2406's
 * well is relaxed (bulk Si spacing in both directions, incoherent) and
 * TQ-2504's interfaces are broad. Returns the wafer.md `images:` lines.
 */
import type { DemoWafer } from "../generate-demo.ts";
import type { DemoWriter } from "./extras.ts";
import { latticeDismukes, strainedSiOnRelaxedSiGe } from "../../src/physics/sige.ts";
import { syntheticMicrograph, type SyntheticMicrographSpec } from "../../src/synth/micrograph.ts";
import { micrographPng } from "../../src/synth/micrographPng.ts";
import { writeTiff } from "../../src/synth/tiffFile.ts";

const PX_NM = 0.05;
const SIZE = 512;

interface DemoImage {
  /** 10–90 % interface width, nm. */
  width_nm: number;
  tilt_deg: number;
  axis: "up" | "down" | "left" | "right";
  relaxed?: boolean;
  bitDepth: 8 | 16;
  /** Image width across the growth axis, pixels (default 512; narrower keeps the 16-bit file light). */
  across?: number;
  reference?: [number, number, number, number];
  /** Written as the microscope's 16-bit TIFF (Deflate), its scale in the resolution tags and not in wafer.md. */
  tiff?: boolean;
}

const IMAGES: Record<string, DemoImage> = {
  "TQ-2401": { width_nm: 1.1, tilt_deg: 0.4, axis: "up", bitDepth: 8 },
  "TQ-2405": { width_nm: 0.8, tilt_deg: 1.8, axis: "up", bitDepth: 16, across: 320 },
  "TQ-2406": { width_nm: 1.2, tilt_deg: -0.6, axis: "up", relaxed: true, bitDepth: 8 },
  "TQ-2504": { width_nm: 2.4, tilt_deg: 1.2, axis: "right", bitDepth: 8 },
  "TQ-2507": { width_nm: 0.9, tilt_deg: 0.7, axis: "up", bitDepth: 16, across: 256, tiff: true },
};

export async function imagesDemo(w: DemoWafer, io: DemoWriter): Promise<string> {
  const d = IMAGES[w.id];
  if (!d) return "";
  const px = PX_NM * 1e-9;
  const aB = latticeDismukes(0.3);
  const si = strainedSiOnRelaxedSiGe(0.3);
  const wellNm = w.run === "TQ25-B" ? 8 : 10;
  const across = d.across ?? SIZE;
  const vertical = d.axis === "up" || d.axis === "down";
  const [width, height] = vertical ? [across, SIZE] : [SIZE, across];
  const spec: SyntheticMicrographSpec = {
    width,
    height,
    pixelSize_m: px,
    inPlaneSpacing_m: aB / Math.SQRT2,
    wellInPlaneSpacing_m: d.relaxed ? latticeDismukes(0) / Math.SQRT2 : undefined,
    barrierSpacing_m: aB / 2,
    wellSpacing_m: (d.relaxed ? latticeDismukes(0) : si.aPerpendicular) / 2,
    wellThickness_m: wellNm * 1e-9,
    wellCentre_m: 2e-9,
    interfaceTau_m: (d.width_nm * 1e-9) / (2 * Math.log(9)),
    centred: true,
    noise: 0.06,
    tilt_deg: d.tilt_deg,
    growthAxis: d.axis,
    seed: io.seed,
  };
  const img = syntheticMicrograph(spec);
  const file = `images/${w.id}-haadf-01.${d.tiff ? "tif" : "png"}`;
  if (d.tiff) {
    const levels = Array.from(img.pixels, (v) => Math.round(Math.min(1, Math.max(0, v)) * 65535));
    await io.write(
      `wafers/${w.id}/${file}`,
      writeTiff({ width, height, samples: levels, bits: 16, format: "uint", compression: "deflate", pixelNm: PX_NM, rowsPerStrip: 32 }),
    );
  } else await io.write(`wafers/${w.id}/${file}`, micrographPng(img.pixels, width, height, d.bitDepth));
  const lines = [
    "images:",
    `  - file: ${file}`,
    ...(d.tiff ? ["    # pixel size: read from the TIFF's resolution tags"] : [`    pixel_nm: ${PX_NM}`]),
    "    kind: haadf",
    `    growth_axis: ${d.axis}`,
  ];
  if (d.reference) lines.push(`    reference: [${d.reference.join(", ")}]`);
  return lines.join("\n");
}
