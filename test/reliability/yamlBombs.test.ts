/**
 * YAML alias bombs ("billion laughs": nine anchors, each a list repeating the
 * one before nine times, 9^9 ≈ 387 million strings from ~350 bytes) in every
 * YAML input — wafer.md front matter (under an unknown key and as a field
 * value), a run note, targets.yaml, analysis.yaml — get a located error at
 * once; the other wafers still build. Limits: src/read/yamlLoad.ts,
 * docs/formats.md "Limits".
 *
 * Sizes (derived by hand from the rule "a node counts one, a list counts
 * itself and its items, an alias counts the node it repeats"): level a is a
 * list of 9 strings, 10 nodes; b = 1 + 9·10 = 91; c = 820; d = 7381;
 * e = 66430; f = 597871. What the aliases repeat, line by line: b 90, c 819,
 * d 7380, e 66429 (total 74718), then the first *e of line f brings it to
 * 141148, past 100,000: the error points at that alias.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import * as yaml from "js-yaml";
import { afterAll, describe, expect, it } from "vitest";
import { readFrontMatter, readYaml } from "../../src/read/frontMatter.ts";
import { loadSiteInputs } from "../../src/validate/load/site.ts";
import { loadYaml } from "../../src/read/yamlLoad.ts";
import { formatProblem } from "../../src/model/problem.ts";
import { buildCase, HEALTHY_DIR, ROOT } from "./corpus.ts";
import { problemMessage } from "../helpers/problems.ts";

const NAMES = "abcdefghi";

/** The nine bomb lines, each indented by `indent`. */
function laughs(indent: string): string {
  const lines = [`${indent}a: &a [${Array(9).fill('"lol"').join(",")}]`];
  for (let i = 1; i < 9; i++)
    lines.push(
      `${indent}${NAMES[i]}: &${NAMES[i]} [${Array(9)
        .fill(`*${NAMES[i - 1]}`)
        .join(",")}]`,
    );
  return lines.join("\n");
}

const okRecord = (id: string, extra: string) =>
  `---\nwafer: ${id}\n${extra}\nrun: R1\ngrown: 2024-05-02\ndevices:\n  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/*.csv" }\n---\n\nNotes.\n`;

const tmps: string[] = [];
afterAll(async () => {
  for (const t of tmps) await fs.rm(t, { recursive: true, force: true });
});
async function tempData(): Promise<{ data: string; out: string }> {
  const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-yaml-bombs-"));
  tmps.push(tmp);
  const data = path.join(tmp, "data");
  await fs.cp(HEALTHY_DIR, data, { recursive: true });
  return { data, out: path.join(tmp, "site") };
}

describe("the YAML loader's alias budget", () => {
  it("refuses a billion-laughs document at the alias that passes 100,000 repeated nodes, in well under 2 s", () => {
    const t0 = performance.now();
    const msg = problemMessage(() => readYaml(`lol:\n${laughs("  ")}\n`, "analysis.yaml"));
    expect(performance.now() - t0).toBeLessThan(2000);
    // Line 7 of the file is "  f: &f [*e,…"; its first "*" is column 10.
    expect(msg).toBe(
      'analysis.yaml:7:10: YAML alias limit: too many nodes repeated through aliases (more than 100,000 after expanding the aliases up to here) (expected at most 1000 aliases, repeating at most 100,000 nodes in all, found "  f: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]") — write the values out instead of repeating them through aliases (docs/formats.md, Limits)',
    );
  });

  it("keeps honest aliases: the same data as js-yaml's own load", () => {
    const text = "geometry: &hb { geometry: hall-bar, length_um: 100, width_um: 20 }\ndevices:\n  - *hb\n  - *hb\nlimits: &l [1, 2, 3]\nagain: *l\n";
    expect(loadYaml(text)).toEqual(yaml.load(text));
  });

  it("accepts exactly 100,000 repeated nodes and refuses 100,001 (common practice: the limit is inclusive)", () => {
    // An anchored list of 999 strings is 1000 nodes; 100 aliases to it repeat 100,000.
    const list = `big: &b [${Array(999).fill("x").join(",")}]\n`;
    const at = list + `r: [${Array(100).fill("*b").join(",")}]\n`;
    expect(() => loadYaml(at)).not.toThrow();
    expect(problemMessage(() => readYaml(at + "one: &s y\nmore: *s\n", "targets.yaml"))).toMatch(
      /^targets\.yaml:4:7: YAML alias limit: too many nodes repeated/,
    );
  });

  it("refuses more than 1000 aliases however small", () => {
    const text = `s: &s 1\nr: [${Array(1001).fill("*s").join(",")}]\n`;
    expect(problemMessage(() => readYaml(text, "targets.yaml"))).toMatch(/^targets\.yaml:2:\d+: YAML alias limit: aliases exceeded maxAliases \(1000\)/);
    expect(() => loadYaml(`s: &s 1\nr: [${Array(1000).fill("*s").join(",")}]\n`)).not.toThrow();
  });

  it("locates a bomb in front matter on the file's own line", () => {
    expect(problemMessage(() => readFrontMatter(okRecord("W-1", `lol:\n${laughs("  ")}`), "wafers/W-1/wafer.md"))).toMatch(
      /^wafers\/W-1\/wafer\.md:9:10: YAML alias limit: /,
    );
  });
});

describe("alias bombs in a build", () => {
  it("in wafer.md (unknown key, field value) and a run note: located errors; a wafer's bomb leaves the other wafers building, a run note's stops the build (a site-wide error, issue 15)", async () => {
    const { data, out } = await tempData();
    for (const [id, extra] of [
      ["BOMB-KEY", `lol:\n${laughs("  ")}`],
      ["BOMB-VALUE", `title:\n${laughs("  ")}`],
    ]) {
      await fs.cp(path.join(data, "wafers", "OK-1"), path.join(data, "wafers", id), { recursive: true });
      await fs.writeFile(path.join(data, "wafers", id, "wafer.md"), okRecord(id, extra));
    }
    const r = await buildCase(data, out);
    expect(r.ok).toBe(true);
    const lines = r.problems.map(formatProblem);
    expect(lines).toHaveLength(2);
    expect(lines.sort()).toEqual([
      expect.stringMatching(/^wafers\/BOMB-KEY\/wafer\.md:9:10: YAML alias limit: /),
      expect.stringMatching(/^wafers\/BOMB-VALUE\/wafer\.md:9:10: YAML alias limit: /),
    ]);
    const verdicts = Object.fromEntries(r.outcomes.map((o) => [o.folder, o.judgement.verdict]));
    expect(verdicts).toEqual({ "BOMB-KEY": "error", "BOMB-VALUE": "error", "OK-1": "pass" });
    // The whole file's peak memory (vitest itself included) stays far below the 4 GB the bomb used to take.
    expect(process.resourceUsage().maxRSS * 1024).toBeLessThan(512 * 2 ** 20);
    // A whole build (workers, rendering) takes about 4 s on an idle machine; the bound leaves room for a busy one.

    // A run note is a site-wide input: its bomb is a located error from the site loader, which stops the build.
    await fs.mkdir(path.join(data, "runs"));
    await fs.writeFile(path.join(data, "runs", "R1.md"), `---\nreactor: R-2\nrecipe:\n${laughs("  ")}\n---\n\nA run.\n`);
    const site = await loadSiteInputs(data);
    expect(site.problems.map(formatProblem)).toEqual([expect.stringMatching(/^runs\/R1\.md:9:10: YAML alias limit: /)]);
  }, 60_000);

  it("in targets.yaml and analysis.yaml: located errors from the site loader", async () => {
    const { data } = await tempData();
    await fs.writeFile(path.join(data, "targets.yaml"), `default_grade: test\nlol:\n${laughs("  ")}\ngrades:\n  test: {}\n`);
    await fs.writeFile(path.join(data, "analysis.yaml"), `hall_min_r2: 0.99\nlol:\n${laughs("  ")}\n`);
    const site = await loadSiteInputs(data);
    expect(site.problems.map(formatProblem)).toEqual([
      expect.stringMatching(/^targets\.yaml:8:10: YAML alias limit: /),
      expect.stringMatching(/^analysis\.yaml:8:10: YAML alias limit: /),
    ]);
    expect(site.waferFolders).toEqual(["OK-1"]);
  }, 20_000);

  it("reading and validating a bomb record fits in a 200 MB heap", async () => {
    // A separate Node process with its heap capped at 200 MB: expanding the bomb anywhere would abort it.
    const script = [
      'import { loadWafer } from "./src/validate/load/wafer.ts";',
      'import { loadSiteInputs } from "./src/validate/load/site.ts";',
      'import { DEFAULT_SETTINGS } from "./src/validate/settings.ts";',
      "const data = process.env.BOMB_DATA;",
      "const site = await loadSiteInputs(data);",
      'const w = await loadWafer("BOMB-VALUE", { dataDir: data, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS });',
      "console.log(JSON.stringify({ site: site.problems.length, wafer: w.problems.length }));",
    ].join("\n");
    const { data } = await tempData();
    await fs.cp(path.join(data, "wafers", "OK-1"), path.join(data, "wafers", "BOMB-VALUE"), { recursive: true });
    await fs.writeFile(path.join(data, "wafers", "BOMB-VALUE", "wafer.md"), okRecord("BOMB-VALUE", `title:\n${laughs("  ")}`));
    await fs.mkdir(path.join(data, "runs"));
    await fs.writeFile(path.join(data, "runs", "R1.md"), `---\nrecipe:\n${laughs("  ")}\n---\n`);
    const { stdout } = await promisify(execFile)(process.execPath, ["--max-old-space-size=200", "--import", "tsx", "--input-type=module", "-e", script], {
      cwd: ROOT,
      env: { ...process.env, BOMB_DATA: data },
      timeout: 18_000,
    });
    expect(JSON.parse(stdout)).toEqual({ site: 1, wafer: 1 });
  }, 20_000);
});
