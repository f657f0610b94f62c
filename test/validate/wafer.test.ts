import { describe, expect, it } from "vitest";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { problemMessage } from "../helpers/problems.ts";
import { applySettings, DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateWafer } from "../../src/validate/wafer.ts";

const ctx = { folder: "W-1", file: "wafers/W-1/wafer.md", today: "2026-12-01", siteSettings: DEFAULT_SETTINGS };

function load(text: string) {
  return validateWafer(readFrontMatter(text, ctx.file), ctx);
}
const message = (text: string) => problemMessage(() => load(text));

const ok =
  '---\nwafer: W-1\nrun: R-1\ngrown: 2025-03-14\ndevices:\n  - id: HB1\n    geometry: hall-bar\n    length_um: 100\n    width_um: 20\n    files: "t/*.csv"\nanalysis:\n  hall_max_field: "150 mT"\n---\nNotes *here*.\n';

describe("wafer record", () => {
  it("reads a valid record with overrides in SI", () => {
    const r = load(ok);
    expect(r.grown).toBe("2025-03-14");
    expect(r.devices[0].geometry).toBe("hall-bar");
    expect(r.settings.hall_max_field).toBeCloseTo(0.15, 12);
    expect(r.notes.trim()).toBe("Notes *here*.");
  });
  const cases: [string, string, string][] = [
    [
      "no front matter",
      "wafer: W-1\n",
      'wafers/W-1/wafer.md:1: no front matter (expected the file to start with a line "---", the YAML fields, and another "---", found "wafer: W-1") — add the front matter block; see docs/formats.md',
    ],
    [
      "YAML syntax error with line and column",
      "---\nwafer: W-1\nrun: [R-1\ngrown: 2025-01-01\n---\n",
      'wafers/W-1/wafer.md:4:1: YAML syntax error: deficient indentation (expected valid YAML (spaces for indentation, "key: value"), found "grown: 2025-01-01") — check the indentation and quoting on that line',
    ],
    ["unknown key with a hint", ok.replace("run: R-1", "run: R-1\ngrwon: 2025-01-01"), "wafers/W-1/wafer.md:4: grwon: unknown key"],
    [
      "wrong type",
      ok.replace("length_um: 100", "length_um: long"),
      'wafers/W-1/wafer.md:8: devices[0].length_um: wrong type (expected a number, found "long") — see docs/formats.md for this field',
    ],
    [
      "id not matching the folder",
      ok.replace("wafer: W-1", "wafer: W-2"),
      'wafers/W-1/wafer.md:2: wafer: wafer id does not match its folder (expected "W-1", found "W-2") — make the id and the folder name the same (rename one of them)',
    ],
    [
      "future growth date",
      ok.replace("2025-03-14", "2031-01-01"),
      "wafers/W-1/wafer.md:4: grown: date is in the future (expected a date on or before 2026-12-01, found 2031-01-01) — correct the year or month",
    ],
    [
      "missing required field",
      ok.replace("run: R-1\n", ""),
      'wafers/W-1/wafer.md:1: run: required field is missing (expected the growth run id, found nothing) — add a line "run: …" between the two "---" lines',
    ],
    [
      "missing required field inside a device: located at the device",
      ok.replace('    files: "t/*.csv"\n', ""),
      'wafers/W-1/wafer.md:6: devices[0].files: required field is missing (expected a value for "files", found nothing) — add "files: …" to devices[0]',
    ],
    [
      "front matter that is a list",
      "---\n- a\n- b\n---\n",
      'wafers/W-1/wafer.md:2: front matter must be a mapping of fields (expected key: value lines, found a list of 2) — write one "key: value" per line between the two "---" lines, such as "wafer: <id>"; see docs/formats.md',
    ],
    [
      "bad geometry",
      ok.replace("geometry: hall-bar", "geometry: hallbar"),
      'wafers/W-1/wafer.md:7: devices[0].geometry: value is not one of the allowed choices (expected hall-bar | van-der-pauw, found "hallbar") — use hall-bar or van-der-pauw',
    ],
    ["unknown setting", ok.replace("hall_max_field", "hall_max_feild"), "wafers/W-1/wafer.md:12: analysis.hall_max_feild: unknown analysis setting"],
    [
      "setting with the wrong dimension",
      ok.replace('"150 mT"', '"150 mV"'),
      'wafers/W-1/wafer.md:12: analysis.hall_max_field: cannot read setting (upper end of the low-field range used for the Hall slope) (expected a value with a unit convertible to T, such as "1 T", found "150 mV", which has a different dimension (a voltage, not a magnetic field; a magnetic field is written in T, mT)) — see docs/formats.md, section Analysis settings',
    ],
  ];
  for (const [name, text, expected] of cases) {
    it(name, () => {
      const m = message(text);
      expect(m.slice(0, expected.length)).toBe(expected);
    });
  }
  it("YAML errors report line and column in the file", () => {
    expect(message("---\nwafer: W-1\nrun: [R-1\ngrown: 2025-01-01\n---\n")).toMatch(/^wafers\/W-1\/wafer\.md:\d+:\d+: YAML syntax error/);
    // The unclosed "[" of line 3 is noticed at line 4, column 1 (the file's own numbering, "---" being line 1).
    expect(message("---\nwafer: W-1\nrun: [R-1\ngrown: 2025-01-01\n---\n")).toBe(
      'wafers/W-1/wafer.md:4:1: YAML syntax error: deficient indentation (expected valid YAML (spaces for indentation, "key: value"), found "grown: 2025-01-01") — check the indentation and quoting on that line',
    );
  });
  it("near-miss keys get a did-you-mean hint", () => {
    expect(message(ok.replace("run: R-1", "run: R-1\ngrwon: 2025-01-01"))).toContain('did you mean "grown"?');
    expect(message(ok.replace("hall_max_field", "hall_max_feild"))).toContain('did you mean "hall_max_field"?');
  });
  it("an analysis.yaml that is not a mapping is located at its first line, with a fix", () => {
    expect(problemMessage(() => applySettings(DEFAULT_SETTINGS, "fast", { file: "analysis.yaml", field: "", line: 1 }))).toBe(
      'analysis.yaml:1: analysis settings must be a mapping (expected key: value pairs, found "fast") — write one "setting: value" per line, such as hall_max_field: "0.2 T"; see docs/formats.md, section Analysis settings',
    );
  });
  it("ids that could escape a path are refused", () => {
    expect(message(ok.replace("run: R-1", "run: ../etc"))).toMatch(/run: not a valid id/);
  });
});
