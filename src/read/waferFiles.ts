/**
 * What a section loader may do with a wafer's folder: expand a glob field of
 * wafer.md, read a matched file's bytes or text (with every safety check, and
 * recorded for provenance), and report a located problem.
 */
import type { Problem } from "../model/problem.ts";

export interface WaferFileReader {
  /** Wafer id (= folder name). */
  wafer: string;
  /** Path of wafer.md relative to the data folder. */
  recordFile: string;
  /** Expands a pattern relative to the wafer folder; reports "matches no file" itself and returns []. `field` is the wafer.md field, e.g. "xrd.files". */
  glob(pattern: string, field: string): string[];
  /** Reads a file (path relative to the wafer folder) as UTF-8 text; `role` is recorded in provenance. Throws InputError. */
  readText(rel: string, role: string): Promise<{ rel: string; text: string }>;
  /** Reads a file as bytes (images). Throws InputError. */
  readBytes(rel: string, role: string): Promise<{ rel: string; bytes: Buffer }>;
  /** Adds a problem to this wafer. */
  report(problem: Omit<Problem, "wafer">): void;
  /** Runs fn; an InputError it throws becomes a problem of this wafer and fn's result is undefined. */
  guard<T>(fn: () => Promise<T>): Promise<T | undefined>;
  /** The line of a wafer.md field, for messages. */
  lineOf(field: string): number | undefined;
}
