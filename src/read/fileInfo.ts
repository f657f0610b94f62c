/** Provenance of one file read: path, size and SHA-256 of the bytes actually read, and its role. */
import { createHash } from "node:crypto";

export interface RawFileInfo {
  /** Path relative to the data folder. */
  path: string;
  bytes: number;
  sha256: string;
  /** What the file is for: record, sweep, xrd, profile, image. */
  role: string;
}

export function fileInfo(rel: string, bytes: Buffer, role: string): RawFileInfo {
  return { path: rel, bytes: bytes.length, sha256: createHash("sha256").update(bytes).digest("hex"), role };
}
