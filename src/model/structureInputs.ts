/**
 * The typed inputs of the structure analysis (X-ray diffraction and depth profiles), as the
 * validators in src/validate/xrd.ts and src/validate/depthProfile.ts hand them on and
 * src/analyse/structure/ takes them. Types only; SI units unless a field says otherwise.
 */

/** Miller indices h k l of a reflection. */
export type Miller = readonly [number, number, number];

/** One point of a reciprocal-space map. */
export interface MapPoint {
  /** ω, rad. */
  omega: number;
  /** 2θ, rad. */
  twoTheta: number;
  counts: number;
}

/** One row of an X-ray peak table (docs/formats.md). */
export interface TableRow {
  layer: string;
  /** rad */
  omega: number;
  twoTheta: number;
  omegaStdErr?: number;
  twoThetaStdErr?: number;
}

/** A validated X-ray file: a reciprocal-space map or a peak table. */
export interface XrdCommon {
  file: string;
  reflection: Miller;
  /** m */
  wavelength: number;
  wavelengthGiven: boolean;
}
export type XrdFile = (XrdCommon & { kind: "map"; points: MapPoint[]; grid: boolean }) | (XrdCommon & { kind: "peaks"; rows: TableRow[] });

/** A validated composition depth profile. */
export interface DepthProfileFile {
  file: string;
  /** Technique as written in `# method:` ("unspecified" when absent). */
  method: string;
  /** nm, increasing. */
  depth: number[];
  /** Ge fraction, 1. */
  ge: number[];
  /** Element → cm⁻³. */
  contaminants: Record<string, number[]>;
}

/** A wafer's structure files, as loaded for the analysis. */
export interface StructureInputs {
  xrd?: XrdFile[];
  profiles?: DepthProfileFile[];
}
