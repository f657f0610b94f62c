import { describe, expect, it } from "vitest";
import { lineOfField } from "../../src/read/frontMatter.ts";

// Lines counted by hand in the texts below (1-based file lines; the texts start on line 1).
const TEXT = [
  "wafer: TQ-1", //                         1
  "notes: |", //                            2
  "  devices: this line is text,", //       3 (inside a literal block: not a key)
  "  not a field", //                       4
  "# devices: a comment", //                5
  "devices:", //                            6
  "  - id: A", //                           7
  "    geometry: {width_um: 50,", //        8
  "      length_um: 100}", //               9
  "  - id: B", //                          10
  "    'geometry':", //                    11
  "      width_um: &w 60", //              12
  "      length_um: *w", //                13
  "stack: [ {name: cap}, {name: well,", // 14
  "         ge: 0} ]", //                  15
].join("\n");

describe("lineOfField: exact lines from js-yaml's event positions", () => {
  it("finds keys, not look-alikes in block text or comments", () => {
    expect(lineOfField(TEXT, "wafer", 1)).toBe(1);
    expect(lineOfField(TEXT, "devices", 1)).toBe(6);
    expect(lineOfField(TEXT, "notes", 1)).toBe(2);
  });
  it("walks sequence items and flow mappings across lines", () => {
    expect(lineOfField(TEXT, "devices[0]", 1)).toBe(7);
    expect(lineOfField(TEXT, "devices[0].geometry.length_um", 1)).toBe(9);
    expect(lineOfField(TEXT, "devices.1.id", 1)).toBe(10);
    expect(lineOfField(TEXT, "devices[1].geometry.length_um", 1)).toBe(13);
    expect(lineOfField(TEXT, "stack[1].ge", 1)).toBe(15);
  });
  it("an absent field gives its nearest present ancestor; nothing present gives undefined", () => {
    expect(lineOfField(TEXT, "devices[1].geometry.thickness", 1)).toBe(11);
    expect(lineOfField(TEXT, "devices[5]", 1)).toBe(6);
    expect(lineOfField(TEXT, "runs", 1)).toBeUndefined();
    expect(lineOfField("a: [", "a", 1)).toBeUndefined();
  });
  it('front-matter text that starts with the newline after "---" keeps the file\'s numbering', () => {
    // gray-matter's matter text: "\nwafer: …" with the block starting on file line 2.
    expect(lineOfField("\nwafer: X\nrun: R1\n", "run", 2)).toBe(3);
    expect(lineOfField("\r\nwafer: X\r\nrun: R1\r\n", "run", 2)).toBe(3);
  });
});
