/** Demo images files for one wafer; returns the wafer.md lines that point at them. */
import type { DemoWafer } from "../generate-demo.ts";
import type { DemoWriter } from "./extras.ts";

export async function imagesDemo(_w: DemoWafer, _io: DemoWriter): Promise<string> {
  return "";
}
