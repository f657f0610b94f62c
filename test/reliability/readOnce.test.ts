/**
 * Issue 13 §5, one file, read once: a sweep swapped again and again for a
 * link to a file outside the data folder while it is being read is read as
 * the file it was or refused with a located error; the outside file's bytes
 * are never returned. The raw copy is made from a checked descriptor too, and
 * a FIFO cannot stall a read.
 *
 * Sources: POSIX open(2) O_NOFOLLOW / O_NONBLOCK and rename(2) atomicity, and
 * Linux proc(5) /proc/self/fd (from memory). The bytes expected are the ones
 * each test writes.
 */
import { execFileSync, spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { readDataBytes } from "../../src/read/dataFiles.ts";
import { placeRawCopy } from "../../src/cli/writeWaferFiles.ts";
import { BuildStoppedError } from "../../src/cli/outputFolder.ts";
import { InputError } from "../../src/model/problem.ts";
import { useTempDir } from "../helpers/tempDir.ts";

const tmp = useTempDir("read-once");
const INSIDE = "B_T,Rxx_ohm,Rxy_ohm\n0,100,0\n";
const OUTSIDE = "SECRET outside the data folder\n";
const sha = (s: string | Buffer) => createHash("sha256").update(s).digest("hex");

async function layout(name: string): Promise<{ data: string; sweep: string; outside: string }> {
  const root = path.join(tmp(), name);
  const data = path.join(root, "data");
  await fs.mkdir(path.join(data, "wafers", "W-1"), { recursive: true });
  const outside = path.join(root, "outside.csv");
  await fs.writeFile(outside, OUTSIDE);
  const sweep = path.join(data, "wafers", "W-1", "sweep.csv");
  await fs.writeFile(sweep, INSIDE);
  return { data, sweep, outside };
}

describe("a file swapped for an outside link while it is read", () => {
  it("is read as itself or refused, never as the outside file, in a thousand racing reads", async () => {
    const { data, sweep, outside } = await layout("race");
    const dir = path.dirname(sweep);
    // Another process swaps the sweep, by atomic renames, between the real file and a link to the outside file.
    const swapper = spawn(
      process.execPath,
      [
        "-e",
        `const fs = require("fs"); const [dir, outside, inside] = process.argv.slice(1);
         for (let i = 0; ; i++) {
           fs.symlinkSync(outside, dir + "/l.tmp"); fs.renameSync(dir + "/l.tmp", dir + "/sweep.csv");
           fs.writeFileSync(dir + "/f.tmp", inside); fs.renameSync(dir + "/f.tmp", dir + "/sweep.csv");
           if (i === 0) process.stdout.write("go");
         }`,
        dir,
        outside,
        INSIDE,
      ],
      { stdio: ["ignore", "pipe", "inherit"] },
    );
    try {
      await new Promise((resolve) => swapper.stdout.once("data", resolve));
      const seen = { inside: 0, refused: 0, outside: 0, other: [] as string[] };
      // A thousand reads at least; on a busy machine more, until both outcomes have been seen (at most 20000).
      for (let i = 0; i < 1000 || ((seen.inside === 0 || seen.refused === 0) && i < 20_000); i++) {
        try {
          const text = (await readDataBytes(data, sweep)).bytes.toString("utf8");
          if (text === INSIDE) seen.inside++;
          else if (text.includes("SECRET")) seen.outside++;
          else seen.other.push(text);
        } catch (err) {
          if (err instanceof InputError && /outside the data folder|replaced while it was being read|file not found/.test(err.message)) seen.refused++;
          else seen.other.push(String(err));
        }
      }
      expect(seen.outside).toBe(0);
      expect(seen.other).toEqual([]);
      // Both kinds of outcome happened, so the race was really run.
      expect(seen.inside).toBeGreaterThan(0);
      expect(seen.refused).toBeGreaterThan(0);
    } finally {
      swapper.kill();
    }
  }, 20_000);

  it("the raw copy refuses a file that has become a link outside the data folder, even with the analysed bytes", async () => {
    const { data, sweep, outside } = await layout("copy");
    await fs.writeFile(outside, INSIDE);
    await fs.rm(sweep);
    await fs.symlink(outside, sweep);
    const dest = path.join(tmp(), "copy-dest.csv");
    const err = await placeRawCopy(sweep, dest, path.join(tmp(), "no-previous.csv"), sha(INSIDE), "wafers/W-1/sweep.csv", undefined, data).catch(
      (e: unknown) => e,
    );
    expect(err).toBeInstanceOf(BuildStoppedError);
    expect((err as Error).message).toMatch(/^wafers\/W-1\/sweep\.csv changed while the site was being built/);
    await expect(fs.access(dest)).rejects.toThrow();
  });

  it("the raw copy of an intact file holds exactly the analysed bytes", async () => {
    const { data, sweep } = await layout("copy-ok");
    const dest = path.join(tmp(), "copy-ok-dest.csv");
    await placeRawCopy(sweep, dest, path.join(tmp(), "no-previous.csv"), sha(INSIDE), "wafers/W-1/sweep.csv", undefined, data);
    expect(await fs.readFile(dest, "utf8")).toBe(INSIDE);
  });

  it("a FIFO named like a sweep is refused at once instead of stalling the read", async () => {
    const { data } = await layout("fifo");
    const fifo = path.join(data, "wafers", "W-1", "pipe.csv");
    execFileSync("mkfifo", [fifo]);
    const err = await readDataBytes(data, fifo).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).message).toBe(
      "wafers/W-1/pipe.csv: not a regular file (expected a file, found a folder or device) — make the pattern or path that names it match files only",
    );
  });
});
