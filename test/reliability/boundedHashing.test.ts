/**
 * Issue 13 §4 (hashing): stray large files in a wafer folder, named by no
 * pattern, are hashed for the cache key through a bounded buffer, so memory
 * stays bounded whatever their size, several at once included. Measured in a
 * child process (its peak resident set, getrusage ru_maxrss) on sparse files
 * (a truncate to 160 MiB is instant and takes no disk space).
 *
 * Sources: SHA-256 (FIPS 180-4) from node:crypto, computed here over the same
 * bytes (zeros, then a marker) written out independently of the code checked.
 */
import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { ROOT } from "./corpus.ts";

const execFileP = promisify(execFile);
const tmp = useTempDir("bounded-hashing");
const MiB = 1 << 20;
const SIZE = 160 * MiB;
const FILES = 4;
const MARK = Buffer.from("end of a stray file\n");

/** SHA-256 of SIZE − MARK.length zero bytes followed by MARK, fed 1 MiB at a time. */
function expectedDigest(): string {
  const h = createHash("sha256");
  const zeros = Buffer.alloc(MiB);
  let left = SIZE - MARK.length;
  for (; left >= MiB; left -= MiB) h.update(zeros);
  h.update(zeros.subarray(0, left)).update(MARK);
  return h.digest("hex");
}

describe("hashing large stray files", () => {
  it(`keeps memory bounded while hashing ${FILES} files of ${SIZE / MiB} MiB at once, and hashes every byte`, async () => {
    const folder = path.join(tmp(), "wafers", "BIG-1");
    await fs.mkdir(folder, { recursive: true });
    await fs.writeFile(path.join(folder, "wafer.md"), "---\nwafer: BIG-1\n---\n");
    for (let i = 0; i < FILES; i++) {
      const f = path.join(folder, `stray-${i}.bin`);
      await fs.writeFile(f, "");
      await fs.truncate(f, SIZE - MARK.length);
      await fs.appendFile(f, MARK);
    }
    const child = path.join(tmp(), "child.mts");
    await fs.writeFile(
      child,
      `import { cacheKey } from ${JSON.stringify(path.join(ROOT, "src/cli/cache.ts"))};
import { FileHashes, sha256File } from ${JSON.stringify(path.join(ROOT, "src/cli/fileHashes.ts"))};
const folder = process.argv[2];
const before = process.memoryUsage().rss;
const hashes = await FileHashes.open(process.argv[3]);
const key = await cacheKey(folder, "code", {}, hashes);
const one = await sha256File(folder + "/stray-0.bin");
process.stdout.write(JSON.stringify({ before, peak: process.resourceUsage().maxRSS * 1024, key, one, hashed: hashes.hashed }));
`,
    );
    const { stdout } = await execFileP(process.execPath, ["--import", "tsx", child, folder, path.join(tmp(), "cache")], { cwd: ROOT, maxBuffer: MiB });
    const r = JSON.parse(stdout) as { before: number; peak: number; key: string; one: string; hashed: number };
    expect(r.one).toBe(expectedDigest());
    expect(r.hashed).toBe(FILES + 1);
    expect(r.key).toMatch(/^[0-9a-f]{64}$/);
    // Whole-file reads of four files at once would need 640 MiB; chunked hashing needs a few MiB. 128 MiB leaves room for the runtime.
    expect(r.peak - r.before).toBeLessThan(128 * MiB);
  }, 60_000);
});
