/**
 * checkInside with the data folder's real path resolved once per dataDir:
 * the per-file checks and their messages are unchanged, and a data folder
 * that could not be resolved is not remembered.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkInside } from "../../src/read/dataFiles.ts";
import { formatProblem, InputError } from "../../src/validate/problem.ts";

async function message(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    if (e instanceof InputError) return formatProblem(e.problem);
    throw e;
  }
  return "accepted";
}

describe("checkInside", () => {
  let tmp: string;
  beforeAll(async () => {
    tmp = await fs.mkdtemp(path.join(os.tmpdir(), "wb-inside-"));
    await fs.mkdir(path.join(tmp, "real", "w"), { recursive: true });
    await fs.writeFile(path.join(tmp, "real", "w", "a.csv"), "x");
    await fs.writeFile(path.join(tmp, "secret.csv"), "x");
    await fs.symlink(path.join(tmp, "real"), path.join(tmp, "linked")); // the data folder reached through a link
    await fs.symlink(path.join(tmp, "secret.csv"), path.join(tmp, "real", "w", "out.csv"));
  });
  afterAll(async () => fs.rm(tmp, { recursive: true, force: true }));

  it("accepts files inside, refuses links out, reports missing files, on every call", async () => {
    const data = path.join(tmp, "linked");
    for (let k = 0; k < 2; k++) {
      expect(await message(checkInside(data, path.join(data, "w", "a.csv")))).toBe("accepted");
      expect(await message(checkInside(data, path.join(data, "w", "out.csv")))).toMatch(/^w\/out\.csv: refused: this path leads outside the data folder \(expected a file inside the data folder, found a symbolic link or path to ".*secret\.csv"\)/);
      expect(await message(checkInside(data, path.join(data, "w", "none.csv")))).toBe("w/none.csv: file not found — check the file name and that it is committed");
    }
  });
  it("does not remember a data folder that could not be resolved", async () => {
    const data = path.join(tmp, "later");
    await expect(checkInside(data, path.join(data, "a.csv"))).rejects.toThrow(/ENOENT/);
    await fs.mkdir(data);
    await fs.writeFile(path.join(data, "a.csv"), "x");
    expect(await message(checkInside(data, path.join(data, "a.csv")))).toBe("accepted");
  });
});
