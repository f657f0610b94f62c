// Units are read through waferbook's own closed table (src/physics/unitTable.ts), not a units library: the
// package that once did it (mathjs) is not a dependency, no source imports it, and the developer docs do not
// list it (the shared stack notes still name it; DEVELOPERS.md and package.json are the project's own word).
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "../..");
const read = (p: string) => readFileSync(path.join(ROOT, p), "utf8");

function sources(dir: string): string[] {
  return readdirSync(path.join(ROOT, dir), { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sources(path.join(dir, e.name)) : /\.(ts|mjs|js|cjs)$/.test(e.name) ? [path.join(dir, e.name)] : [],
  );
}

describe("no units library", () => {
  it("package.json does not depend on mathjs", () => {
    const pkg = JSON.parse(read("package.json")) as Record<string, Record<string, string> | undefined>;
    for (const field of ["dependencies", "devDependencies", "optionalDependencies", "peerDependencies"])
      expect(Object.keys(pkg[field] ?? {})).not.toContain("mathjs");
  });
  it("no source file imports it", () => {
    const importing = [...sources("src"), ...sources("scripts"), ...sources("bin")].filter((f) =>
      /from\s+["']mathjs|require\(["']mathjs|import\(["']mathjs/.test(read(f)),
    );
    expect(importing).toEqual([]);
  });
  it("DEVELOPERS.md and README.md do not name it", () => {
    for (const doc of ["DEVELOPERS.md", "README.md"]) expect(read(doc), doc).not.toMatch(/math\.?js/i);
  });
});
