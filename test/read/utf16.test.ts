/** A UTF-16 export (Windows "Unicode" text) gets its own message, not "looks binary" (hostile review). */
import { describe, expect, it } from "vitest";
import { decodeText } from "../../src/read/dataFiles.ts";

const text = "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n-1,600,-6000\n1,600,6000\n";
const decode = (bytes: Uint8Array) => {
  try {
    decodeText({ bytes, rel: "wafers/W/t.csv" } as Parameters<typeof decodeText>[0]);
  } catch (e) {
    return (e as { problem: { message: string; found?: string; fix?: string } }).problem;
  }
  throw new Error("not refused");
};

describe("UTF-16 text files", () => {
  it("with a little-endian byte-order mark: named as UTF-16, fix says save as UTF-8", () => {
    const p = decode(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, "utf16le")]));
    expect(p.message).toBe("file is UTF-16 text");
    expect(p.found).toMatch(/FF FE/);
    expect(p.fix).toMatch(/UTF-8/);
  });
  it("without a byte-order mark (every other byte zero) too, big-endian included", () => {
    expect(decode(Buffer.from(text, "utf16le")).message).toBe("file is UTF-16 text");
    const be = Buffer.from(text, "utf16le").swap16();
    expect(decode(be).message).toBe("file is UTF-16 text");
  });
  it("a binary file with a stray NUL is still 'looks binary'", () => {
    expect(decode(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 1, 2, 3, 4])).message).toBe(
      "file looks binary",
    );
  });
});
