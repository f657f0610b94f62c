/**
 * Writes the malformed-input corpus under test/fixtures/bad/ (one folder per
 * case: targets.yaml, wafers/<id>/wafer.md and files) and the small healthy
 * wafer test/fixtures/healthy/. Each case's expected.txt is written by hand
 * review, not by this script: the script keeps an existing expected.txt.
 * Run: npx tsx scripts/bad-fixtures.ts
 */
import { existsSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { PNG } from "pngjs";
import { formatSweep, hallSweepRows } from "../src/synth/hallSweep.ts";

const root = path.resolve(import.meta.dirname, "..");
const BAD = path.join(root, "test", "fixtures", "bad");
const HEALTHY = path.join(root, "test", "fixtures", "healthy");

export const TARGETS = `default_grade: test
grades:
  test:
    peak_mobility: { min: "1e4 cm^2/(V s)" }
`;

function sweep(gate: number, seed: number, points = 41): string {
  const rows = hallSweepRows({
    density: 2e15 + gate * 1e15,
    mobility: 5 + gate,
    geometry: "hall-bar",
    length_um: 100,
    width_um: 20,
    maxField: 0.5,
    points,
    noise: 1e-4,
    seed,
  });
  return formatSweep({ gate: `${gate.toFixed(2)} V`, temperature: "1.6 K" }, rows);
}

function record(
  id: string,
  extra = "",
  devices = `devices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/*.csv" }\n`,
): string {
  return `---\nwafer: ${id}\nrun: R1\ngrown: 2024-05-02\n${devices}${extra}---\n\nNotes.\n`;
}

type Files = Record<string, string | Buffer>;
const cases: Record<string, Files> = {};
const W = (c: string, id: string, files: Files) => {
  cases[c] = Object.fromEntries(
    Object.entries(files).map(([k, v]) => [k.startsWith("targets.yaml") ? k : `wafers/${id}/${k}`, v === "@RECORD@" ? record(id) : v]),
  );
};
const good = (gate = 0.5) => sweep(gate, 7);
const header = "# gate: 0.50 V\nB [T],Rxx [ohm],Rxy [ohm]\n";
const rows = (n = 5) =>
  Array.from({ length: n }, (_, i) => {
    const b = -0.5 + i * (1 / (n - 1));
    return `${b.toFixed(3)},500.0,${(-1000 * b).toFixed(1)}`;
  }).join("\n") + "\n";
const csv = (body: string | Buffer) => ({ "wafer.md": "@RECORD@", "transport/s.csv": body });

function png(width: number, height: number, colour: boolean): Buffer {
  const p = new PNG({ width, height, colorType: colour ? 2 : 0, inputColorType: 2, bitDepth: 8 });
  for (let i = 0; i < width * height; i++) {
    const v = (i * 37) % 256;
    p.data[4 * i] = v;
    p.data[4 * i + 1] = colour ? 255 - v : v;
    p.data[4 * i + 2] = v;
    p.data[4 * i + 3] = 255;
  }
  return PNG.sync.write(p, { colorType: colour ? 2 : 0, inputColorType: 6, bitDepth: 8 });
}

// --- wafer.md ---
W("no-front-matter", "NOFM", { "wafer.md": "wafer: NOFM\nrun: R1\n", "transport/a.csv": good() });
W("front-matter-unclosed", "OPEN", { "wafer.md": "---\nwafer: OPEN\nrun: R1\ngrown: 2024-05-02\n", "transport/a.csv": good() });
W("yaml-syntax-error", "YAMLERR", {
  "wafer.md": "---\nwafer: YAMLERR\nrun: R1\ngrown: 2024-05-02\ndevices:\n  - id: HB1\n   geometry: hall-bar\n---\n",
  "transport/a.csv": good(),
});
W("yaml-tab-indent", "YAMLTAB", {
  "wafer.md": "---\nwafer: YAMLTAB\nrun: R1\ngrown: 2024-05-02\nstack:\n\t- { name: well, role: well }\n---\n",
  "transport/a.csv": good(),
});
W("yaml-unclosed-quote", "YAMLQ", { "wafer.md": '---\nwafer: YAMLQ\nrun: "R1\ngrown: 2024-05-02\n---\n', "transport/a.csv": good() });
W("wrong-type-devices", "TYPEDEV", { "wafer.md": record("TYPEDEV", "", "devices: HB1\n") });
W("wrong-type-thickness", "TYPETHK", {
  "wafer.md": record("TYPETHK", "stack:\n  - { name: well, role: well, thickness_nm: ten }\n"),
  "transport/a.csv": good(),
});
W("wrong-type-grown", "TYPEDATE", { "wafer.md": "---\nwafer: TYPEDATE\nrun: R1\ngrown: 2024\n---\n" });
W("unknown-key-near-miss", "KEYNEAR", { "wafer.md": record("KEYNEAR", "reactr: Heron\n"), "transport/a.csv": good() });
W("unknown-key-far", "KEYFAR", { "wafer.md": record("KEYFAR", "favourite_colour: blue\n"), "transport/a.csv": good() });
W("unknown-device-key", "KEYDEV", {
  "wafer.md": record("KEYDEV", "", 'devices:\n  - id: HB1\n    geometry: hall-bar\n    lenght_um: 100\n    width_um: 20\n    files: "transport/*.csv"\n'),
  "transport/a.csv": good(),
});
W("missing-required-field", "NORUN", { "wafer.md": "---\nwafer: NORUN\ngrown: 2024-05-02\n---\n" });
W("bad-enum-geometry", "ENUM", {
  "wafer.md": record("ENUM", "", 'devices:\n  - { id: HB1, geometry: hallbar, length_um: 100, width_um: 20, files: "transport/*.csv" }\n'),
  "transport/a.csv": good(),
});
W("id-not-matching-folder", "FOLDER-A", { "wafer.md": record("FOLDER-B"), "transport/a.csv": good() });
W("id-bad-pattern", "PATTERN", { "wafer.md": record('"../PATTERN"'), "transport/a.csv": good() });
W("future-growth-date", "FUTURE", { "wafer.md": record("FUTURE").replace("2024-05-02", "2031-01-01"), "transport/a.csv": good() });
W("not-a-calendar-date", "FEB30", { "wafer.md": record("FEB30").replace("2024-05-02", "2024-02-30"), "transport/a.csv": good() });
W("hall-bar-without-dimensions", "NODIM", {
  "wafer.md": record("NODIM", "", 'devices:\n  - { id: HB1, geometry: hall-bar, files: "transport/*.csv" }\n'),
  "transport/a.csv": good(),
});
W("duplicate-device-id", "DUPDEV", {
  "wafer.md": record(
    "DUPDEV",
    "",
    'devices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/*.csv" }\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/*.csv" }\n',
  ),
  "transport/a.csv": good(),
});
// Two problems in one wafer.md: both are reported (issue 15).
W("unknown-waiver-metric", "WAIVE", {
  "wafer.md": record(
    "WAIVE",
    'waivers:\n  - { metric: peak_mobilty, reason: "accepted", approved_by: "A. Nobody", date: 2024-06-01 }\n',
    `devices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 5O, files: "transport/*.csv" }\n`,
  ),
  "transport/a.csv": good(),
});
W("unknown-grade", "GRADE", { "wafer.md": record("GRADE", "grade: qubitt\n"), "transport/a.csv": good() });
cases["duplicate-wafer-id-case"] = {
  "wafers/DUP-1/wafer.md": record("DUP-1"),
  "wafers/DUP-1/transport/a.csv": good(),
  "wafers/dup-1/wafer.md": record("dup-1"),
  "wafers/dup-1/transport/a.csv": good(),
};
// --- globs ---
W("glob-no-match", "NOMATCH", {
  "wafer.md": record("NOMATCH", "", 'devices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/HB9/*.csv" }\n'),
  "transport/a.csv": good(),
});
W("glob-escapes-folder", "ESCAPE", {
  "wafer.md": record("ESCAPE", "", 'devices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "../OK-1/transport/*.csv" }\n'),
});
W("glob-absolute", "ABSOLUTE", {
  "wafer.md": record("ABSOLUTE", "", 'devices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "/etc/*" }\n'),
});
W("xrd-glob-escapes-folder", "XRDESC", { "wafer.md": record("XRDESC", 'xrd: { files: "../../targets.yaml" }\n'), "transport/a.csv": good() });
W("image-path-escapes-folder", "IMGESC", {
  "wafer.md": record("IMGESC", 'images:\n  - { file: "../OK-1/wafer.md", pixel_nm: 0.1, kind: haadf, growth_axis: up }\n'),
  "transport/a.csv": good(),
});
W("symlink-outside-data", "SYMLINK", { "wafer.md": record("SYMLINK"), "transport/a.csv": good() }); // the test adds transport/link.csv → a file outside
W("file-too-large", "HUGE", { "wafer.md": record("HUGE"), "transport/a.csv": good() }); // the test adds a sparse transport/huge.csv above the limit
// --- file content ---
W("empty-file", "EMPTY", csv(""));
W("header-only", "HEADONLY", csv(header));
W("metadata-only", "METAONLY", csv("# gate: 0.5 V\n# temperature: 1.6 K\n"));
W(
  "not-utf8",
  "LATIN1",
  csv(
    Buffer.concat([
      Buffer.from("# gate: 0.5 V\n# operator: "),
      Buffer.from([0x4d, 0xfc, 0x6c, 0x6c, 0x65, 0x72]),
      Buffer.from("\n" + header.slice(15) + rows()),
    ]),
  ),
);
W("binary-file", "BINARY", csv(Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00, 0x08, 0x00])));
W("unknown-column", "UNKCOL", csv("# gate: 0.5 V\nB [T],Rxz [ohm],Rxy [ohm]\n" + rows()));
// Problems in different columns and a metadata line: every one is reported, not just the first column's (issue 15).
W(
  "two-bad-columns",
  "TWOCOL",
  csv(
    "# gate: 0.5 V\n# temperature: 1.6 parsecs\nB [T],Rxx [kg],Rxy [ohm]\n-0.500,500.0,500.0\n-0.250,500.0,OVL\n0.000,500.0,0.0\n0.250,500.0,-250.0\n0.500,500.0,n/a\n",
  ),
);
W("duplicate-column", "DUPCOL", csv("# gate: 0.5 V\nB [T],Rxx [ohm],Rxx [ohm]\n" + rows()));
W("missing-required-column", "NORXX", csv("# gate: 0.5 V\nB [T],Rxy [ohm]\n-0.5,500\n0.5,-500\n"));
W("missing-column-vdp", "NORA", {
  "wafer.md": record("NORA", "", 'devices:\n  - { id: V1, geometry: van-der-pauw, files: "transport/*.csv" }\n'),
  "transport/s.csv": header + rows(),
});
W("no-sweep-axis", "NOAXIS", csv("# gate: 0.5 V\nRxx [ohm],Rxy [ohm]\n500,1\n"));
W("both-sweep-axes", "BOTHAX", csv("# gate: 0.5 V\nB [T],Vg [V],Rxx [ohm],Rxy [ohm]\n-0.5,0.5,500,1\n0.5,0.5,500,-1\n"));
W("bad-header-cell", "BADHEAD", csv("# gate: 0.5 V\nB (T),Rxx [ohm],Rxy [ohm]\n" + rows()));
W("non-numeric-cell", "OVLD", csv(header + rows(3) + "0.6,OVLD,-600\n"));
W("nan-cell", "NAN", csv(header + "-0.5,500,500\n0.0,NaN,0\n0.5,500,-500\n"));
W("infinity-cell", "INF", csv(header + "-0.5,500,500\n0.0,500,Infinity\n0.5,500,-500\n"));
W("empty-cell", "EMPTYCELL", csv(header + "-0.5,500,500\n0.0,,0\n0.5,500,-500\n"));
W("ragged-row", "RAGGED", csv(header + "-0.5,500,500\n0.0,500\n0.5,500,-500\n"));
W("unknown-unit", "UNIT", csv("# gate: 0.5 V\nB [Tesla],Rxx [ohm],Rxy [ohm]\n" + rows()));
W("wrong-dimension-unit", "DIMUNIT", csv("# gate: 0.5 V\nB [T],Rxx [mV],Rxy [ohm]\n" + rows()));
W("missing-unit", "NOUNIT", csv("# gate: 0.5 V\nB,Rxx [ohm],Rxy [ohm]\n" + rows()));
W("bad-metadata-unit", "METAUNIT", csv("# gate: 0.5 volts\nB [T],Rxx [ohm],Rxy [ohm]\n" + rows()));
W("metadata-twice", "META2", csv("# gate: 0.5 V\n# gate: 0.6 V\nB [T],Rxx [ohm],Rxy [ohm]\n" + rows()));
W("field-sweep-without-gate", "NOGATE", csv("# temperature: 1.6 K\nB [T],Rxx [ohm],Rxy [ohm]\n" + rows()));
W("unsorted-field", "UNSORTED", csv(header + "-0.5,500,500\n0.5,500,-500\n0.0,500,0\n"));
W("repeated-field", "REPEAT", csv(header + "-0.5,500,500\n0.0,500,0\n0.0,501,0\n0.5,500,-500\n"));
W("single-sign-field", "ONESIGN", {
  "wafer.md": record("ONESIGN"),
  "transport/a.csv": good()
    .split("\n")
    .filter((l) => !l.startsWith("-"))
    .join("\n"),
});
W("too-few-field-values", "FEWB", csv(header + "0.0,500,0\n0.5,500,-500\n"));
W("zero-current-column", "ZEROI", csv("# gate: 0.5 V\nB [T],Vxx [V],Vxy [V],I [nA]\n-0.5,5e-6,5e-6,10\n0,5e-6,0,0\n0.5,5e-6,-5e-6,10\n"));
W("zero-current-metadata", "ZEROIM", csv("# gate: 0.5 V\n# current: 0 nA\nB [T],Vxx [V],Vxy [V]\n-0.5,5e-6,5e-6\n0.5,5e-6,-5e-6\n"));
W("voltage-without-current", "NOI", csv("# gate: 0.5 V\nB [T],Vxx [V],Vxy [V]\n-0.5,5e-6,5e-6\n0.5,5e-6,-5e-6\n"));
W("gate-sweep-only", "GATEONLY", {
  "wafer.md": record("GATEONLY"),
  "transport/gate_up.csv":
    "# field: 0 T\nVg [V],Rxx [ohm],Rxy [ohm]\n" +
    Array.from({ length: 11 }, (_, i) => `${(0.1 * i).toFixed(1)},${(5000 / (1 + i)).toFixed(1)},0.1`).join("\n") +
    "\n",
});
// --- targets.yaml (site-wide) ---
cases["targets-unparseable-unit"] = { "targets.yaml": TARGETS.replace("1e4 cm^2/(V s)", "1e4 furlongs") };
cases["targets-incompatible-unit"] = { "targets.yaml": TARGETS.replace("1e4 cm^2/(V s)", "1e4 cm^-2") };
cases["targets-bare-number"] = { "targets.yaml": TARGETS.replace('"1e4 cm^2/(V s)"', "10000") };
// Every problem of the file: a misspelt metric, a bad aggregate, an unknown finding and consequence (issue 15).
cases["targets-unknown-metric"] = {
  "targets.yaml":
    TARGETS.replace("peak_mobility", "peak_mobilty") +
    '    turn_on_voltage: { max: "1.0 V", aggregate: maximum }\n    findings:\n      incoherent_wel: note\n      one_sign_field: ignore\n',
};
cases["targets-yaml-syntax-error"] = { "targets.yaml": 'default_grade: test\ngrades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)"\n' };
cases["targets-reversed-between"] = { "targets.yaml": TARGETS.replace('{ min: "1e4 cm^2/(V s)" }', '{ between: ["2e4 cm^2/(V s)", "1e4 cm^2/(V s)"] }') };
// --- structure and images ---
const xrdRec = (id: string) =>
  record(
    id,
    'stack:\n  - { name: well, role: well, ge: 0, thickness_nm: 10 }\n  - { name: vbuf, role: buffer, ge: 0.3, thickness_nm: 3000 }\n  - { name: substrate, role: substrate }\nxrd: { files: "xrd/*.csv" }\n',
  );
const peaks = "layer,omega [deg],two_theta [deg]\nsubstrate,34.5643,69.1286\nvbuf,33.7310,67.4620\n";
W("xrd-missing-reflection", "XRDREFL", { "wafer.md": xrdRec("XRDREFL"), "transport/a.csv": good(), "xrd/p.csv": peaks });
W("xrd-bad-wavelength-unit", "XRDWAVE", {
  "wafer.md": xrdRec("XRDWAVE"),
  "transport/a.csv": good(),
  "xrd/p.csv": "# reflection: 0 0 4\n# wavelength: 0.154 furlong\n" + peaks,
});
W("xrd-unknown-layer", "XRDLAYER", {
  "wafer.md": xrdRec("XRDLAYER"),
  "transport/a.csv": good(),
  "xrd/p.csv": "# reflection: 0 0 4\n" + peaks + "welll,34.0,68.5\n",
});
W("xrd-angle-unit", "XRDRAD", {
  "wafer.md": xrdRec("XRDRAD"),
  "transport/a.csv": good(),
  "xrd/p.csv": "# reflection: 0 0 4\n" + peaks.replace("omega [deg]", "omega [rad]"),
});
W("profile-unknown-column", "PROFCOL", {
  "wafer.md": record("PROFCOL", 'profiles: { files: "profiles/*.csv" }\n'),
  "transport/a.csv": good(),
  "profiles/sims.csv": "# method: SIMS\ndepth [nm],Gee [1]\n" + Array.from({ length: 25 }, (_, i) => `${i},0.3`).join("\n") + "\n",
});
W("profile-too-few-rows", "PROFFEW", {
  "wafer.md": record("PROFFEW", 'profiles: { files: "profiles/*.csv" }\n'),
  "transport/a.csv": good(),
  "profiles/sims.csv": "# method: SIMS\ndepth [nm],Ge [1]\n0,0.3\n1,0.3\n2,0\n",
});
const imgRec = (id: string, file: string, ref = "") => record(id, `images:\n  - { file: ${file}, pixel_nm: 0.1, kind: haadf, growth_axis: up${ref} }\n`);
W("image-not-png", "IMGTXT", {
  "wafer.md": imgRec("IMGTXT", "images/a.png"),
  "transport/a.csv": good(),
  "images/a.png": "this is a text file, not a picture\n",
});
W("image-jpeg", "IMGJPG", {
  "wafer.md": imgRec("IMGJPG", "images/a.png"),
  "transport/a.csv": good(),
  "images/a.png": Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0, 0x10, 0x4a, 0x46, 0x49, 0x46]),
});
W("image-colour-png", "IMGRGB", { "wafer.md": imgRec("IMGRGB", "images/a.png"), "transport/a.csv": good(), "images/a.png": png(8, 8, true) });
W("image-reference-outside", "IMGREF", {
  "wafer.md": imgRec("IMGREF", "images/a.png", ", reference: [0, 0, 64, 64]"),
  "transport/a.csv": good(),
  "images/a.png": png(32, 32, false),
});
W("image-missing-file", "IMGMISS", { "wafer.md": imgRec("IMGMISS", "images/none.png"), "transport/a.csv": good() });

function writeTree(dir: string, files: Files): void {
  for (const [rel, content] of Object.entries(files)) {
    const abs = path.join(dir, rel);
    mkdirSync(path.dirname(abs), { recursive: true });
    writeFileSync(abs, content);
  }
}

rmSync(HEALTHY, { recursive: true, force: true });
writeTree(HEALTHY, {
  "targets.yaml": TARGETS,
  "wafers/OK-1/wafer.md": record("OK-1"),
  "wafers/OK-1/transport/vg_0p50V.csv": sweep(0.5, 1),
  "wafers/OK-1/transport/vg_0p80V.csv": sweep(0.8, 2),
});
for (const [name, files] of Object.entries(cases)) {
  const dir = path.join(BAD, name);
  const expected = path.join(dir, "expected.txt");
  const keep = existsSync(expected) ? (await import("node:fs")).readFileSync(expected) : undefined;
  rmSync(dir, { recursive: true, force: true });
  writeTree(dir, { "targets.yaml": TARGETS, ...files });
  if (keep) writeFileSync(expected, keep);
}
console.log(`${Object.keys(cases).length} cases`);
