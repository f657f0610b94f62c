/**
 * The package's version, read from its package.json. A module of its own so
 * `waferbook --version` (and `check --version`, `init --version`) loads this
 * and paths.ts only, not the build and everything it imports.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { PACKAGE_ROOT } from "./paths.ts";

export async function readVersion(): Promise<string> {
  const pkg = JSON.parse(await fs.readFile(path.join(PACKAGE_ROOT, "package.json"), "utf8")) as { version: string };
  return pkg.version;
}
