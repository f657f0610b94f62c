/**
 * Hook for the structure, profile and image demo files of later analyses.
 * Returns extra front-matter lines for wafer.md.
 */
import type { DemoWafer } from "../generate-demo.ts";

export interface DemoWriter {
  write: (rel: string, text: string) => Promise<void>;
  seed: number;
}

export async function demoExtras(_w: DemoWafer, _io: DemoWriter): Promise<string> {
  return "";
}
