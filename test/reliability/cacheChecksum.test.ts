/**
 * Issue 13 §7, the cache cannot lie: every cache entry carries the SHA-256 of
 * its payload, checked on every read. A flipped bit makes the next build warn,
 * naming the entry, analyse the wafer again and publish the right number.
 *
 * Sources: SHA-256 (FIPS 180-4) is node:crypto's; the expected numbers are the
 * ones the first build published; IEEE 754 binary64 layout (sign, 11-bit
 * exponent, 52-bit mantissa, little-endian in V8's serialisation) from memory.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { build } from "../../src/cli/build.ts";
import { entryPath, readEntry, writeEntry, type CacheEntry } from "../../src/cli/cache.ts";
import { useTempDir } from "../helpers/tempDir.ts";
import { HEALTHY_DIR, io } from "./corpus.ts";

const tmp = useTempDir("cache-checksum");

async function entryFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const sub of await fs.readdir(dir, { withFileTypes: true })) {
    if (!sub.isDirectory()) continue;
    for (const f of await fs.readdir(path.join(dir, sub.name))) if (f.endsWith(".v8")) out.push(path.join(dir, sub.name, f));
  }
  return out.sort();
}

/**
 * Flips mantissa bit 45 (a relative change of 2^-7, so it shows at six
 * significant figures) of every binary64 in `bytes` that equals `value` times
 * a power of ten to 1e-6 (the entry holds figures in SI; results.json in the
 * metric's unit). Returns how many were changed.
 */
function flipNumber(bytes: Buffer, value: number): number {
  let flipped = 0;
  for (let off = 0; off + 8 <= bytes.length; off++) {
    const x = bytes.readDoubleLE(off);
    if (!Number.isFinite(x) || x === 0) continue;
    const ratio = Math.log10(Math.abs(x / value));
    const k = Math.round(ratio);
    if (Math.abs(k) <= 9 && Math.abs(x / 10 ** k / value - 1) < 1e-6) {
      bytes[off + 5] ^= 0x20;
      flipped++;
      off += 7;
    }
  }
  return flipped;
}

describe("a damaged cache entry", () => {
  it("one flipped bit in a figure's copies: the next build warns, naming the entry, and publishes the correct number", async () => {
    const data = path.join(tmp(), "data");
    const out = path.join(tmp(), "site");
    const cache = path.join(tmp(), "cache");
    await fs.cp(HEALTHY_DIR, data, { recursive: true });
    const opts = { data, out, strict: false, basePath: "/", quiet: true, cache };
    const first = await build(opts, io);
    expect(first.problems.filter((p) => /cache entry/.test(p.message))).toEqual([]);
    const results = async () =>
      JSON.parse(await fs.readFile(path.join(out, "wafers", "OK-1", "results.json"), "utf8")) as { metrics: Record<string, { value: number | null }> };
    const published = (await results()).metrics.peak_mobility.value;
    expect(typeof published).toBe("number");

    const files = await entryFiles(cache);
    expect(files.length).toBeGreaterThanOrEqual(2);
    let flipped = 0;
    for (const f of files) {
      const bytes = await fs.readFile(f);
      flipped += flipNumber(bytes, published!);
      await fs.writeFile(f, bytes);
    }
    expect(flipped).toBeGreaterThan(0);

    const second = await build(opts, io);
    const warnings = second.problems.filter((p) => p.severity === "warning" && /cache entry/.test(p.message));
    expect(warnings.length).toBeGreaterThan(0);
    expect(warnings[0].message).toContain(path.join(cache, ""));
    expect(warnings[0].message).toMatch(/\.v8 was damaged and has been discarded/);
    expect(warnings[0].wafer).toBe("OK-1");
    expect((await results()).metrics.peak_mobility.value).toBe(published);
    expect(second.stats?.analysed).toBe(1);

    // The damaged entry was replaced by a sound one: a third build is a clean cache hit.
    const third = await build(opts, io);
    expect(third.problems.filter((p) => /cache entry/.test(p.message))).toEqual([]);
    expect(third.stats?.cacheHits).toBe(1);
  }, 90_000);

  it("an entry with a sound checksum that records other bytes than its key's files is not used (a file changed under the analysis)", async () => {
    const data = path.join(tmp(), "stale-data");
    const out = path.join(tmp(), "stale-site");
    const cache = path.join(tmp(), "stale-cache");
    await fs.cp(HEALTHY_DIR, data, { recursive: true });
    const opts = { data, out, strict: false, basePath: "/", quiet: true, cache };
    const mobility = async () =>
      (JSON.parse(await fs.readFile(path.join(out, "wafers", "OK-1", "results.json"), "utf8")) as { metrics: Record<string, { value: number }> }).metrics
        .peak_mobility.value;
    await build(opts, io);
    const before = await mobility();
    const entriesA = await entryFiles(cache);
    const record = path.join(data, "wafers", "OK-1", "wafer.md");
    await fs.writeFile(record, (await fs.readFile(record, "utf8")).replace("width_um: 20", "width_um: 25"));
    await build(opts, io);
    const after = await mobility();
    // μ = 1/(n e ρ) with ρ = R W/L: a wider bar, the same resistances, a lower mobility (common practice, van der Pauw / Hall bar geometry).
    expect(after).toBeLessThan(before);
    const entriesB = (await entryFiles(cache)).filter((f) => !entriesA.includes(f));
    expect(entriesB).toHaveLength(2);
    // What a build racing an edit could have stored: the entries made from the old bytes, under the new bytes' key.
    for (const b of entriesB) await fs.copyFile(entriesA.find((a) => a.endsWith(".slim.v8") === b.endsWith(".slim.v8"))!, b);
    const third = await build(opts, io);
    expect(third.problems.find((p) => /cache entry/.test(p.message))?.message).toMatch(
      /records wafers\/OK-1\/wafer\.md with other bytes than the file holds now/,
    );
    expect(await mobility()).toBe(after);
  }, 90_000);

  it("property: any single flipped bit anywhere in an entry file is caught, reported and the entry discarded", async () => {
    const cache = path.join(tmp(), "unit-cache");
    const entry: CacheEntry = { folder: "W-1", files: [{ path: "wafers/W-1/wafer.md", bytes: 10, sha256: "0".repeat(64), role: "record" }], problems: [] };
    await writeEntry(cache, "ab".repeat(32), entry);
    const file = entryPath(cache, "ab".repeat(32), "slim");
    const sound = await fs.readFile(file);
    expect(await readEntry(cache, "ab".repeat(32), "slim")).toEqual(entry);
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: sound.length * 8 - 1 }), async (bit) => {
        const bytes = Buffer.from(sound);
        bytes[bit >> 3] ^= 1 << (bit & 7);
        await fs.writeFile(file, bytes);
        const reports: string[] = [];
        expect(await readEntry(cache, "ab".repeat(32), "slim", (f, reason) => reports.push(`${f}: ${reason}`))).toBeUndefined();
        expect(reports).toHaveLength(1);
        expect(reports[0].startsWith(file)).toBe(true);
        await expect(fs.access(file)).rejects.toThrow();
      }),
      { numRuns: 60, seed: 1307 },
    );
  });
});
