/**
 * Issue 13 §10: a raw/<SHA-256> link keeps opening the bytes it named. After a
 * raw file is replaced and the site rebuilt (twice), the old object is still
 * published beside the new one: raw/ is append-only across builds. Only
 * objects this version would write are carried over — an active-type copy, a
 * name without extension, a link or a stray file left in the previous raw/
 * are not. The expectations are this program's own rules (docs/publishing.md).
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { build } from "../../src/cli/build.ts";
import { io } from "./corpus.ts";
import { healthyData } from "./outputHelpers.ts";

const tempDir = useTempDir("retain");
const sha = (b: Buffer | string) => createHash("sha256").update(b).digest("hex");

describe("raw objects are kept across builds", () => {
  it("a replaced file's old copy stays published, with its bytes, through later builds; foreign names are dropped", async () => {
    const data = await healthyData(path.join(tempDir(), "data"));
    const out = path.join(tempDir(), "site");
    const opts = { data, out, strict: false, basePath: "/", quiet: true };
    await build(opts, io);
    const sweep = path.join(data, "wafers", "OK-1", "transport", "vg_0p50V.csv");
    const original = await fs.readFile(sweep);
    const first = (await fs.readdir(path.join(out, "raw"))).sort();
    expect(first).toContain(`${sha(original)}.csv`);
    // What an older version (or a hand) may have left in the published raw/ folder.
    const prevRaw = path.join(await fs.realpath(out), "raw");
    const planted = [`${sha("a")}.html`, `${sha("b")}.svg`, sha("c"), "notes.txt", `${sha("d")}.csv`];
    for (const n of planted.slice(0, 4)) await fs.writeFile(path.join(prevRaw, n), "<script>alert(1)</script>\n");
    await fs.symlink("/etc/hostname", path.join(prevRaw, planted[4]));

    // The file is replaced (one more line: still a valid sweep) and the site built again, twice.
    await fs.writeFile(sweep, Buffer.concat([original, Buffer.from("\n")]));
    const replaced = await fs.readFile(sweep);
    for (let i = 0; i < 2; i++) {
      expect((await build(opts, io)).ok).toBe(true);
      const names = await fs.readdir(path.join(out, "raw"));
      expect(names).toEqual(expect.arrayContaining([...first, `${sha(replaced)}.csv`]));
      expect(sha(await fs.readFile(path.join(out, "raw", `${sha(original)}.csv`)))).toBe(sha(original));
      for (const n of planted) expect(names, n).not.toContain(n);
      expect(names.length).toBe(first.length + 1);
    }
    // The wafer page links the current copy.
    expect(await fs.readFile(path.join(out, "wafers", "OK-1", "index.html"), "utf8")).toContain(`../../raw/${sha(replaced)}.csv`);
  }, 120_000);
});
