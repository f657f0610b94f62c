/**
 * checkInside with the data folder's real path resolved once per dataDir:
 * the per-file checks and their messages are unchanged, and a data folder
 * that could not be resolved is not remembered.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkInside, decodeText, listFiles } from "../../src/read/dataFiles.ts";
import { formatProblem, InputError } from "../../src/model/problem.ts";

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
      expect(await message(checkInside(data, path.join(data, "w", "out.csv")))).toMatch(
        /^w\/out\.csv: refused: this path leads outside the data folder \(expected a file inside the data folder, found a symbolic link or path to ".*secret\.csv"\)/,
      );
      expect(await message(checkInside(data, path.join(data, "w", "none.csv")))).toBe(
        "w/none.csv: file not found — check the file name and that it is committed",
      );
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

describe("listFiles (node's recursive readdir)", () => {
  let tmp: string;
  beforeAll(async () => {
    tmp = await fs.mkdtemp(path.join(os.tmpdir(), "wb-list-"));
    const w = path.join(tmp, "w");
    await fs.mkdir(path.join(w, "transport", "HB1"), { recursive: true });
    await fs.mkdir(path.join(w, "empty"));
    await fs.mkdir(path.join(tmp, "elsewhere"));
    await fs.writeFile(path.join(tmp, "elsewhere", "hidden.csv"), "x");
    await fs.writeFile(path.join(w, "wafer.md"), "x");
    await fs.writeFile(path.join(w, "transport", "HB1", "b.csv"), "x");
    await fs.writeFile(path.join(w, "transport", "HB1", "a.csv"), "x");
    await fs.symlink(path.join(tmp, "elsewhere"), path.join(w, "transport", "linked")); // a folder link: listed, never descended into
    await fs.symlink(path.join(w, "wafer.md"), path.join(w, "copy.md"));
  });
  afterAll(async () => fs.rm(tmp, { recursive: true, force: true }));

  it("lists every non-folder entry, relative with '/', sorted; links are names, not walked", async () => {
    const expected = ["copy.md", "transport/HB1/a.csv", "transport/HB1/b.csv", "transport/linked", "wafer.md"];
    expect(await listFiles(path.join(tmp, "w"))).toEqual(expected);
    // the same through a link to the folder (a linked wafer folder)
    await fs.symlink(path.join(tmp, "w"), path.join(tmp, "wl")).catch(() => undefined);
    expect(await listFiles(path.join(tmp, "wl"))).toEqual(expected);
  });
});

describe("decodeText on ill-formed UTF-8", () => {
  // Two good lines ("B_T,Rxx_Ohm\n" and "0,1\n", 16 bytes), then "2," and the bad sequence at offset 18 on line 3.
  const decode = (bad: number[]) => {
    const bytes = Buffer.concat([Buffer.from("B_T,Rxx_Ohm\n0,1\n2,"), Buffer.from(bad), Buffer.from("\n")]);
    try {
      decodeText({ rel: "w/s.csv", abs: "/nowhere/w/s.csv", bytes });
    } catch (e) {
      if (e instanceof InputError) return formatProblem(e.problem);
      throw e;
    }
    return "accepted";
  };
  const fix = " — re-save the file as UTF-8 (for example from a Latin-1 export)";
  it('points at an overlong form (C0 AF, an overlong "/")', () => {
    expect(decode([0xc0, 0xaf])).toBe(`w/s.csv:3: bytes are not valid UTF-8 (expected UTF-8 text, found byte 0xc0 at offset 18)${fix}`);
  });
  it("points at an overlong three-byte form (E0 80 AF)", () => {
    expect(decode([0xe0, 0x80, 0xaf])).toBe(`w/s.csv:3: bytes are not valid UTF-8 (expected UTF-8 text, found byte 0xe0 at offset 18)${fix}`);
  });
  it("points at an encoded surrogate (ED A0 80, U+D800)", () => {
    expect(decode([0xed, 0xa0, 0x80])).toBe(`w/s.csv:3: bytes are not valid UTF-8 (expected UTF-8 text, found byte 0xed at offset 18)${fix}`);
  });
  it("points at a lead byte past U+10FFFF (F5, and F4 90)", () => {
    expect(decode([0xf5, 0x80, 0x80, 0x80])).toBe(`w/s.csv:3: bytes are not valid UTF-8 (expected UTF-8 text, found byte 0xf5 at offset 18)${fix}`);
    expect(decode([0xf4, 0x90, 0x80, 0x80])).toBe(`w/s.csv:3: bytes are not valid UTF-8 (expected UTF-8 text, found byte 0xf4 at offset 18)${fix}`);
  });
  it("passes the well-formed edges of each range (U+0080, U+0800, U+D7FF, U+E000, U+10000, U+10FFFF) and points at what follows", () => {
    const good = [0xc2, 0x80, 0xe0, 0xa0, 0x80, 0xed, 0x9f, 0xbf, 0xee, 0x80, 0x80, 0xf0, 0x90, 0x80, 0x80, 0xf4, 0x8f, 0xbf, 0xbf];
    expect(decode(good)).toBe("accepted");
    expect(decode([...good, 0xc1, 0xbf])).toBe(
      `w/s.csv:3: bytes are not valid UTF-8 (expected UTF-8 text, found byte 0xc1 at offset ${18 + good.length})${fix}`,
    );
  });
});
