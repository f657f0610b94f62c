/**
 * Structure, profile and image demo files of a wafer. Each section writes its
 * own files and returns extra front-matter lines for wafer.md.
 */
import type { DemoWafer } from "../generate-demo.ts";
import { structureDemo } from "./structure.ts";
import { imagesDemo } from "./images.ts";

export interface DemoWriter {
  write: (rel: string, text: string | Buffer) => Promise<void>;
  seed: number;
}

export async function demoExtras(w: DemoWafer, io: DemoWriter): Promise<string> {
  const lines = [await structureDemo(w, io), await imagesDemo(w, io)];
  return lines.filter(Boolean).join("\n");
}
