/**
 * Names that collide with the site: a wafer or run id equal to a name the
 * site writes for itself (`run: index.html` used to crash rendering with an
 * internal error and no site) is refused with a located error, in any letter
 * case; a folder chain longer than the system's path limit (ENAMETOOLONG) is
 * a located error too. The other wafers build. The reserved list is checked
 * against what a build actually writes.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import { formatProblem } from "../../src/model/problem.ts";
import { loadSiteInputs } from "../../src/validate/load/site.ts";
import { isSiteName, SITE_NAMES } from "../../src/validate/siteNames.ts";
import { buildCase, HEALTHY_DIR } from "./corpus.ts";

const run = promisify(execFile);
const tmps: string[] = [];
// `rm -rf`, not fs.rm: Node's recursive removal fails on a path longer than PATH_MAX.
afterAll(async () => {
  for (const t of tmps) await run("rm", ["-rf", t]);
});

async function copyWafer(data: string, id: string, edit: (text: string) => string = (t) => t): Promise<void> {
  const dir = path.join(data, "wafers", id);
  await fs.cp(path.join(data, "wafers", "OK-1"), dir, { recursive: true });
  const record = path.join(dir, "wafer.md");
  await fs.writeFile(record, edit((await fs.readFile(record, "utf8")).replace("wafer: OK-1", `wafer: ${id}`)));
}

describe("the reserved names", () => {
  it.each(["index.html", "INDEX.HTML", "Assets", "raw", "runs", "wafers", "trends", "search-index.json", "Results.Json", "results.csv"])(
    "%s is a site name",
    (id) => expect(isSiteName(id)).toBe(true),
  );
  it.each(["TQ-2401", "R1", "index", "html", "raws", "asset"])("%s is not", (id) => expect(isSiteName(id)).toBe(false));
});

describe("ids that collide with the site, and a folder chain beyond the path limit", () => {
  it("get located errors; the other wafers and the site are built", async () => {
    const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-site-names-"));
    tmps.push(tmp);
    const data = path.join(tmp, "data");
    const out = path.join(tmp, "site");
    await fs.cp(HEALTHY_DIR, data, { recursive: true });
    await copyWafer(data, "IDX", (t) => t.replace("run: R1", "run: index.html"));
    await copyWafer(data, "Assets");
    await copyWafer(data, "DEEP");
    await fs.mkdir(path.join(data, "runs"));
    await fs.writeFile(path.join(data, "runs", "R1.md"), "---\nreactor: R-2\n---\n\nA run.\n");
    // 21 folders of 200 characters: more than Linux's 4096-byte PATH_MAX. Made with relative steps (cd), as only those can reach it.
    const segment = "d".repeat(200);
    await run("bash", [
      "-c",
      `cd "$1" && for i in $(seq 1 21); do mkdir "$2" && cd "$2" || exit 1; done; echo 1 > deep.csv`,
      "_",
      path.join(data, "wafers", "DEEP"),
      segment,
    ]);

    const r = await buildCase(data, out);
    expect(r.ok).toBe(true);
    const reserved = `(expected an id other than ${SITE_NAMES.join(", ")} (in any letter case), found`;
    const lines = r.problems.map(formatProblem);
    expect(lines).toHaveLength(3);
    expect(lines[0]).toBe(
      `wafers/Assets: wafer id is a name the site uses for its own pages and files ${reserved} "Assets") — rename the folder (and the wafer: field)`,
    );
    expect(lines[1]).toMatch(
      new RegExp(
        `^wafers/DEEP/${segment}: folder path is longer than the system allows \\(expected a path of at most a few thousand characters, found folders nested \\d+ deep, \\d+ characters in all\\) — flatten the folders or shorten their names$`,
      ),
    );
    expect(lines[2]).toBe(
      `wafers/IDX/wafer.md:3: run: run id is a name the site uses for its own pages and files ${reserved} "index.html") — rename the run (and its runs/<id>.md file)`,
    );
    const verdicts = Object.fromEntries(r.outcomes.map((o) => [o.folder, o.judgement.verdict]));
    expect(verdicts).toEqual({ DEEP: "error", IDX: "error", "OK-1": "pass" });
    expect((await fs.stat(path.join(out, "runs", "index.html"))).isFile()).toBe(true);

    // Everything the build wrote beside the ids is in the reserved list (dot-names excepted: no id starts with a dot).
    const ids = new Set(["OK-1", "IDX", "DEEP", "R1"]);
    for (const dir of [".", "wafers", "runs"]) {
      for (const name of await fs.readdir(path.join(out, dir))) {
        if (name.startsWith(".") || ids.has(name)) continue;
        expect(SITE_NAMES, `${dir}/${name}`).toContain(name);
      }
    }

    // A run note is a site-wide input: a reserved run id is a located error from the site loader, which stops the build.
    await fs.writeFile(path.join(data, "runs", "Search.md"), "---\nreactor: R-2\n---\n");
    const site = await loadSiteInputs(data);
    expect(site.problems.map(formatProblem).filter((l) => l.startsWith("runs/"))).toEqual([
      `runs/Search.md: run id is a name the site uses for its own pages and files ${reserved} "Search") — rename the file`,
    ]);
  }, 60_000);
});
