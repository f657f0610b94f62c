/**
 * The typed inputs of the lattice-image analysis: decoded micrographs with their wafer.md
 * description, as src/validate/load/imageFiles.ts hands them on and src/analyse/images/ takes them.
 * Types only.
 */

/** Direction of growth (toward the surface) in the image as shown (src/analyse/images/geometry.ts). */
export type GrowthAxis = "up" | "down" | "left" | "right";

/** A rectangle in pixels, [x0, y0, x1, y1) with x1 > x0 and y1 > y0. */
export type PixelRect = [number, number, number, number];

/** One decoded micrograph with its wafer.md description. */
export interface MicrographInput {
  /** Path relative to the data folder. */
  file: string;
  /** Position in wafer.md's `images:` list. */
  index: number;
  kind: "haadf" | "hrtem";
  pixelSize_m: number;
  /** Where the pixel size came from: wafer.md (`record`) or the TIFF's resolution tags (`file`). */
  pixelSizeSource?: "record" | "file";
  /** Why a TIFF's resolution tags were not used as its scale, when they exist. */
  pixelSizeNote?: string;
  /** File format and sample type, in words ("TIFF, 16-bit integer"). */
  format?: string;
  growthAxis: GrowthAxis;
  /** Reference region in pixels [x0, y0, x1, y1), when wafer.md gives one. */
  reference?: PixelRect;
  width: number;
  height: number;
  /** Row-major intensities, 0…1. */
  pixels: Float32Array;
}

export interface ImageInputs {
  micrographs?: MicrographInput[];
}
