/**
 * The analysis cache key covers everything the loader reads: the bytes behind
 * a symbolic link that stays inside the data folder (the loader follows it),
 * the link itself, and sibling folders whose names differ only in letter case
 * (they make the wafer an error). Checked through cacheKey directly, with and
 * without the file-hash record.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { cacheKey } from "../../src/cli/cache.ts";
import { FileHashes } from "../../src/cli/fileHashes.ts";

const tempDir = useTempDir("key");

describe("cache key", () => {
  it("changes when the file behind a link changes, and when the link is pointed elsewhere", async () => {
    const wafer = path.join(tempDir(), "wafers", "W1");
    await fs.mkdir(path.join(wafer, "transport"), { recursive: true });
    await fs.writeFile(path.join(wafer, "wafer.md"), "---\nwafer: W1\n---\n");
    await fs.writeFile(path.join(tempDir(), "shared-a.csv"), "B [T],Rxx [ohm]\n0,1\n");
    await fs.writeFile(path.join(tempDir(), "shared-b.csv"), "B [T],Rxx [ohm]\n0,1\n");
    await fs.symlink(path.join("..", "..", "..", "shared-a.csv"), path.join(wafer, "transport", "s.csv"));
    for (const hashes of [undefined, await FileHashes.open(path.join(tempDir(), "cache"))]) {
      const k1 = await cacheKey(wafer, "code", {}, hashes);
      await fs.writeFile(path.join(tempDir(), "shared-a.csv"), "B [T],Rxx [ohm]\n0,2\n");
      const k2 = await cacheKey(wafer, "code", {}, hashes);
      expect(k2).not.toBe(k1);
      // Same bytes, another target: the link text is part of the key.
      await fs.writeFile(path.join(tempDir(), "shared-b.csv"), "B [T],Rxx [ohm]\n0,2\n");
      await fs.rm(path.join(wafer, "transport", "s.csv"));
      await fs.symlink(path.join("..", "..", "..", "shared-b.csv"), path.join(wafer, "transport", "s.csv"));
      expect(await cacheKey(wafer, "code", {}, hashes)).not.toBe(k2);
      await fs.rm(path.join(wafer, "transport", "s.csv"));
      await fs.symlink(path.join("..", "..", "..", "shared-a.csv"), path.join(wafer, "transport", "s.csv"));
      await fs.writeFile(path.join(tempDir(), "shared-a.csv"), "B [T],Rxx [ohm]\n0,1\n");
    }
  });

  it("changes with the wafer's letter-case twins", async () => {
    const wafer = path.join(tempDir(), "wafers", "W2");
    await fs.mkdir(wafer, { recursive: true });
    await fs.writeFile(path.join(wafer, "wafer.md"), "---\nwafer: W2\n---\n");
    expect(await cacheKey(wafer, "code", {}, undefined, ["w2"])).not.toBe(await cacheKey(wafer, "code", {}));
  });
});
