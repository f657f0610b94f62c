/**
 * The local file-hash record (src/cli/fileHashes.ts): a stored hash is used
 * only for a file whose size, times, inode and device are unchanged and that
 * was not modified just before it was hashed; any rewrite is read again, even
 * one that restores size and modification time (common practice: the same
 * rules as git's index and its "racily clean" entries).
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { FileHashes } from "../../src/cli/fileHashes.ts";

const tempDir = useTempDir("hashes");

const sha = (s: string) => createHash("sha256").update(s).digest("hex");
const hourAgo = () => new Date(Date.now() - 3600e3);

describe("file-hash record", () => {
  it("reuses a stored hash only for an unchanged, not racily modified file, across save and open", { timeout: 20_000 }, async () => {
    const cache = path.join(tempDir(), "cache");
    const file = path.join(tempDir(), "sweep.csv");
    await fs.writeFile(file, "B [T],Rxx [ohm]\n0,1\n");
    // Just written: hashed, and hashed again next time (modified within the racy window).
    let h = await FileHashes.open(cache);
    expect(await h.sha256(file, await fs.stat(file))).toBe(sha("B [T],Rxx [ohm]\n0,1\n"));
    expect(await h.sha256(file, await fs.stat(file))).toBe(sha("B [T],Rxx [ohm]\n0,1\n"));
    expect([h.hashed, h.reused]).toEqual([2, 0]);
    // Modified an hour before hashing (and its status changed more than the racy window before): the stored hash is used from then on, also after save/open.
    await fs.utimes(file, hourAgo(), hourAgo());
    await new Promise((r) => setTimeout(r, 2100));
    await h.sha256(file, await fs.stat(file));
    await h.save();
    h = await FileHashes.open(cache);
    expect(await h.sha256(file, await fs.stat(file))).toBe(sha("B [T],Rxx [ohm]\n0,1\n"));
    expect([h.hashed, h.reused]).toEqual([0, 1]);
    // Rewritten with the same size and the old modification time restored: ctime gives it away.
    const { mtime } = await fs.stat(file);
    await new Promise((r) => setTimeout(r, 20));
    await fs.writeFile(file, "B [T],Rxx [ohm]\n0,2\n");
    await fs.utimes(file, mtime, mtime);
    expect(await h.sha256(file, await fs.stat(file))).toBe(sha("B [T],Rxx [ohm]\n0,2\n"));
    expect(h.hashed).toBe(1);
  });

  it("without a cache folder it stores nothing and always reads; a damaged record is ignored", async () => {
    const file = path.join(tempDir(), "other.csv");
    await fs.writeFile(file, "x");
    await fs.utimes(file, hourAgo(), hourAgo());
    const none = await FileHashes.open(null);
    await none.sha256(file, await fs.stat(file));
    await none.sha256(file, await fs.stat(file));
    expect([none.hashed, none.reused]).toEqual([2, 0]);
    const cache = path.join(tempDir(), "damaged");
    await fs.mkdir(cache);
    await fs.writeFile(path.join(cache, "file-hashes.json"), "{ not json");
    const h = await FileHashes.open(cache);
    expect(await h.sha256(file, await fs.stat(file))).toBe(sha("x"));
    expect(h.hashed).toBe(1);
  });
});
