/**
 * Raw-file copies (src/cli/build.ts placeRawCopy, src/publish/rawCopies.ts):
 * named by SHA-256; linked from the previous output when it has that name;
 * otherwise copied only if the bytes are the ones analysed — a file that
 * changed during the build stops the build with a clear message.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { BuildStoppedError } from "../../src/cli/outputFolder.ts";
import { placeRawCopy } from "../../src/cli/writeWaferFiles.ts";
import { FileHashes } from "../../src/cli/fileHashes.ts";
import { rawCopyHref, rawCopyPath } from "../../src/publish/rawCopies.ts";

const tempDir = useTempDir("raw");
const sha = (s: string) => createHash("sha256").update(s).digest("hex");

describe("raw-file copies", () => {
  it("are named by SHA-256 with a lower-case inert extension, else .bin", () => {
    const h = sha("x");
    expect(rawCopyPath({ path: "wafers/W/transport/HB1/vg #1?.CSV", sha256: h })).toBe(`raw/${h}.csv`);
    expect(rawCopyPath({ path: "wafers/W/notes", sha256: h })).toBe(`raw/${h}.bin`);
    expect(rawCopyPath({ path: "wafers/W/a.tar.<script>", sha256: h })).toBe(`raw/${h}.bin`);
    expect(rawCopyHref({ path: "wafers/W/wafer.md", sha256: h })).toBe(`../../raw/${h}.md`);
  });

  it("link the previous copy, else copy checked bytes; a changed file stops the build", async () => {
    const raw = path.join(tempDir(), "sweep.csv");
    await fs.writeFile(raw, "B [T],Rxx [ohm]\n0,1\n");
    const good = sha("B [T],Rxx [ohm]\n0,1\n");
    const prev = path.join(tempDir(), "prev.csv");
    await fs.writeFile(prev, "B [T],Rxx [ohm]\n0,1\n");
    // A previous copy of that name: hard-linked (same inode), the raw file not read.
    await placeRawCopy(path.join(tempDir(), "missing.csv"), path.join(tempDir(), "a.csv"), prev, good, "wafers/W/sweep.csv", undefined);
    expect((await fs.stat(path.join(tempDir(), "a.csv"))).ino).toBe((await fs.stat(prev)).ino);
    // No previous copy: read, checked, written.
    await placeRawCopy(raw, path.join(tempDir(), "b.csv"), path.join(tempDir(), "none.csv"), good, "wafers/W/sweep.csv", await FileHashes.open(null));
    expect(await fs.readFile(path.join(tempDir(), "b.csv"), "utf8")).toBe("B [T],Rxx [ohm]\n0,1\n");
    // The file changed since it was analysed.
    const err = await placeRawCopy(
      raw,
      path.join(tempDir(), "c.csv"),
      path.join(tempDir(), "none.csv"),
      sha("something else"),
      "wafers/W/sweep.csv",
      undefined,
    ).catch((e) => e);
    expect(err).toBeInstanceOf(BuildStoppedError);
    expect(err.message).toBe(
      "wafers/W/sweep.csv changed while the site was being built (its bytes no longer match the SHA-256 that was analysed); build again once it is complete",
    );
    await expect(fs.stat(path.join(tempDir(), "c.csv"))).rejects.toThrow();
  });
});
