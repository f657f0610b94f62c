/**
 * Reads and validates a wafer's cross-section micrographs (`images:`).
 *
 * Each entry's file (relative to the wafer folder) is read as bytes through
 * the wafer's file reader (size limit, inside the data folder, provenance),
 * decoded as an 8- or 16-bit greyscale PNG (micrograph.ts), and its
 * `reference` rectangle checked against the image size. A bad entry becomes
 * a located problem of the wafer and is left out; the other images still load.
 */
import type { WaferFileReader } from "../../read/waferFiles.ts";
import type { ImageInputs, MicrographInput } from "../../model/imageInputs.ts";
import type { ImageSpec, WaferRecord } from "../wafer.ts";
import { InputError } from "../../model/problem.ts";
import { decodeMicrograph, MicrographFormatError, type Micrograph } from "../../read/micrograph.ts";
import { decodeTiffMicrograph, isTiff, type TiffPixelSize } from "../../read/tiffMicrograph.ts";

/** Decodes one image entry; throws InputError located at the file and at `images[i].…` in wafer.md. */
async function loadOne(spec: ImageSpec, i: number, files: WaferFileReader, maxPixels: number): Promise<MicrographInput> {
  const field = `images[${i}].file`;
  const { rel, bytes } = await files.readBytes(spec.file, "image").catch((e: unknown) => {
    // A missing file is the record's mistake: point at the line of wafer.md that names it.
    if (e instanceof InputError && e.problem.message === "file not found") {
      throw new InputError({
        file: files.recordFile,
        line: files.lineOf(field),
        field,
        message: "image file not found",
        expected: "a file in the wafer folder",
        found: JSON.stringify(spec.file),
        fix: "check the file name and that the image is committed",
      });
    }
    throw e;
  });
  let img: Micrograph;
  let fileSize: TiffPixelSize = {};
  try {
    if (isTiff(bytes)) {
      const t = decodeTiffMicrograph(bytes, maxPixels);
      img = t;
      fileSize = t.pixelSize;
    } else img = decodeMicrograph(bytes, maxPixels);
  } catch (e) {
    if (!(e instanceof MicrographFormatError)) throw e;
    throw new InputError({
      file: rel,
      field,
      message: e.what,
      expected: e.expected,
      found: e.found,
      fix: `${e.fix} (listed in ${files.recordFile} line ${files.lineOf(field) ?? "?"})`,
    });
  }
  if (spec.reference) {
    const [x0, y0, x1, y1] = spec.reference;
    const rf = `images[${i}].reference`;
    if (!(x1 > x0 && y1 > y0)) {
      throw new InputError({
        file: files.recordFile,
        line: files.lineOf(rf),
        field: rf,
        message: "reference rectangle is empty or reversed",
        expected: "[x0, y0, x1, y1] with x1 > x0 and y1 > y0 (pixels)",
        found: `[${spec.reference.join(", ")}]`,
        fix: "give the left, top, right and bottom edges in that order",
      });
    }
    if (x1 > img.width || y1 > img.height) {
      throw new InputError({
        file: files.recordFile,
        line: files.lineOf(rf),
        field: rf,
        message: "reference rectangle lies outside the image",
        expected: `a rectangle inside the ${img.width}×${img.height} image (x1 ≤ ${img.width}, y1 ≤ ${img.height})`,
        found: `[${spec.reference.join(", ")}]`,
        fix: "measure the reference region on this image, in pixels from its top-left corner",
      });
    }
    if (x1 - x0 < 16 || y1 - y0 < 16) {
      throw new InputError({
        file: files.recordFile,
        line: files.lineOf(rf),
        field: rf,
        message: "reference rectangle is too small",
        expected: "at least 16 × 16 pixels",
        found: `${x1 - x0} × ${y1 - y0} pixels`,
        fix: "enlarge the reference region",
      });
    }
  }
  const pixelField = `images[${i}].pixel_nm`;
  let pixelNm: number;
  let pixelSizeSource: MicrographInput["pixelSizeSource"];
  if (spec.pixel_nm !== undefined) {
    pixelNm = spec.pixel_nm;
    pixelSizeSource = "record";
    if (fileSize.nm !== undefined && Math.abs(fileSize.nm - spec.pixel_nm) > 0.01 * spec.pixel_nm) {
      files.report({
        severity: "warning",
        file: files.recordFile,
        line: files.lineOf(pixelField),
        field: pixelField,
        message: `pixel size in wafer.md differs from the one in ${rel} by ${((100 * Math.abs(fileSize.nm - spec.pixel_nm)) / spec.pixel_nm).toFixed(1)} %`,
        expected: "the two within 1 %",
        found: `${spec.pixel_nm} nm in wafer.md, ${+fileSize.nm.toPrecision(6)} nm from the file's resolution tags`,
        fix: "check the microscope calibration; wafer.md's value is the one used. Remove pixel_nm to use the file's",
      });
    }
  } else if (fileSize.nm !== undefined) {
    pixelNm = fileSize.nm;
    pixelSizeSource = "file";
  } else {
    throw new InputError({
      file: files.recordFile,
      line: files.lineOf(`images[${i}]`),
      field: pixelField,
      message: "no pixel size for the micrograph",
      expected: "pixel_nm in wafer.md, or a TIFF whose resolution tags give the scale",
      found: fileSize.note ? `none in wafer.md, and ${fileSize.note}` : `none in wafer.md or in ${rel}`,
      fix: "add pixel_nm (nm per pixel, from the microscope's calibration) to the image entry",
    });
  }
  return {
    file: rel,
    index: i,
    kind: spec.kind,
    pixelSize_m: pixelNm * 1e-9,
    pixelSizeSource,
    pixelSizeNote: fileSize.note,
    format: `${img.container === "tiff" ? "TIFF" : "PNG"}, ${img.bitDepth}-bit ${img.storedAs.startsWith("float") ? "float" : "integer"}${img.storedAs === "float-rescaled" ? " (negative values: rescaled from its minimum)" : ""}`,
    growthAxis: spec.growth_axis,
    reference: spec.reference,
    width: img.width,
    height: img.height,
    pixels: img.pixels,
  };
}

/** Loads every `images:` entry of a wafer record; see the module comment. */
export async function loadImageInputs(record: WaferRecord, files: WaferFileReader): Promise<ImageInputs> {
  const micrographs: MicrographInput[] = [];
  for (const [i, spec] of record.images.entries()) {
    const m = await files.guard(() => loadOne(spec, i, files, record.settings.max_image_pixels));
    if (m) micrographs.push(m);
  }
  return micrographs.length ? { micrographs } : {};
}
