// Wafer folders that are symbolic links (src/read/linkedFolder.ts): a link that stays inside the data
// folder is followed, and its files are read through it with the usual checks (dataFiles.ts: resolved
// path inside the data folder, opened once with O_NOFOLLOW); every other link is skipped with a located
// warning naming the reason — outside the data folder, dangling, a loop, a file, a folder holding the link.
// The data are the `waferbook init` starter's (its example wafer builds cleanly).
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkData } from "../../src/cli/check.ts";
import { starterFiles } from "../../src/cli/init.ts";
import { cacheKey } from "../../src/cli/cache.ts";
import { formatProblem, type Problem } from "../../src/model/problem.ts";

let root = "";
let data = "";
let result: Awaited<ReturnType<typeof checkData>>;

const linkWarning = (name: string): Problem | undefined => result.problems.find((p) => p.file === `wafers/${name}`);

beforeAll(async () => {
  root = mkdtempSync(path.join(tmpdir(), "wb-links-"));
  data = path.join(root, "data");
  for (const [rel, text] of await starterFiles()) {
    if (!rel.startsWith("data/")) continue;
    // The example wafer lives in data/store/ (as on a drive mounted inside the data folder); wafers/ links to it.
    const to = path.join(data, rel.slice(5).replace(/^wafers\//, "store/"));
    mkdirSync(path.dirname(to), { recursive: true });
    writeFileSync(to, text);
  }
  const wafers = path.join(data, "wafers");
  mkdirSync(wafers);
  mkdirSync(path.join(root, "shared", "TQ-OUT"), { recursive: true });
  symlinkSync("../store/example-01", path.join(wafers, "example-01"));
  symlinkSync(path.join(root, "shared", "TQ-OUT"), path.join(wafers, "TQ-OUT"));
  symlinkSync("../store/gone", path.join(wafers, "TQ-GONE"));
  symlinkSync("TQ-LOOP-B", path.join(wafers, "TQ-LOOP-A"));
  symlinkSync("TQ-LOOP-A", path.join(wafers, "TQ-LOOP-B"));
  symlinkSync("..", path.join(wafers, "TQ-UP"));
  symlinkSync("../targets.yaml", path.join(wafers, "TQ-FILE"));
  result = await checkData(data, "2026-01-01");
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("wafer folders that are symbolic links", () => {
  it("follows a link that stays inside the data folder and reads the wafer through it", () => {
    expect(result.wafers).toBe(1);
    // The example wafer has no problems of its own (init.test.ts builds it); read through the link, it still has none.
    expect(result.problems.filter((p) => p.file.startsWith("wafers/example-01"))).toEqual([]);
    expect(result.files).toBeGreaterThan(3);
  });

  it("names every skipped link with its reason, as a warning", () => {
    const reasons: Record<string, RegExp> = {
      "TQ-OUT": /leads outside the data folder/,
      "TQ-GONE": /dangling/,
      "TQ-LOOP-A": /loop of links/,
      "TQ-LOOP-B": /loop of links/,
      "TQ-UP": /loop \(it leads to a folder that holds the link\)/,
      "TQ-FILE": /leads to a file, not a folder/,
    };
    for (const [name, why] of Object.entries(reasons)) {
      const p = linkWarning(name);
      expect(p, name).toBeDefined();
      expect(p!.severity).toBe("warning");
      expect(formatProblem(p!)).toMatch(new RegExp(`^wafers/${name}: warning: symbolic link skipped: it .*${why.source}`));
      expect(p!.fix).toBeTruthy();
    }
    expect(linkWarning("TQ-OUT")!.found).toContain(path.join(root, "shared", "TQ-OUT"));
    expect(linkWarning("TQ-GONE")!.found).toContain("../store/gone");
    // Warnings only: nothing here is an input error.
    expect(result.problems.filter((p) => p.severity === "error")).toEqual([]);
  });

  it("keys the cache by the files reached through the link, as for the folder itself", async () => {
    const viaLink = await cacheKey(path.join(data, "wafers", "example-01"), "code", {});
    const direct = await cacheKey(path.join(data, "store", "example-01"), "code", {});
    expect(viaLink).toBe(direct);
  });
});

// Links inside a wafer folder (linkedFolder.ts linkInWaferFolder): a link to a folder — outside the data folder,
// or inside it — is not followed, and instead of a bare "file pattern matches no file" the link is named, with
// where it points and why it was skipped; the pattern's error points at that warning. So are a dangling link and a loop.
describe("symbolic links inside a wafer folder", () => {
  let inner: Awaited<ReturnType<typeof checkData>>;
  let innerRoot = "";
  beforeAll(async () => {
    innerRoot = mkdtempSync(path.join(tmpdir(), "wb-inner-links-"));
    const d = path.join(innerRoot, "data");
    for (const [rel, text] of await starterFiles()) {
      if (!rel.startsWith("data/")) continue;
      // The sweep files live outside the data folder (a shared drive); example-01/transport links there.
      const to = rel.includes("/transport/") ? path.join(innerRoot, "drive", rel.slice(rel.indexOf("transport/"))) : path.join(d, rel.slice(5));
      mkdirSync(path.dirname(to), { recursive: true });
      writeFileSync(to, text);
    }
    const w = path.join(d, "wafers", "example-01");
    symlinkSync(path.join(innerRoot, "drive", "transport"), path.join(w, "transport"));
    // A second wafer whose sweeps are in another folder inside the data folder, linked.
    mkdirSync(path.join(d, "wafers", "example-02"));
    mkdirSync(path.join(d, "store"));
    cpSync(path.join(innerRoot, "drive", "transport"), path.join(d, "store", "transport"), { recursive: true });
    writeFileSync(
      path.join(d, "wafers", "example-02", "wafer.md"),
      readFileSync(path.join(w, "wafer.md"), "utf8").replace(/^wafer: example-01 /m, "wafer: example-02 "),
    );
    symlinkSync("../../store/transport", path.join(d, "wafers", "example-02", "transport"));
    symlinkSync("nowhere.csv", path.join(d, "wafers", "example-02", "gone.csv"));
    symlinkSync("loop-b", path.join(d, "wafers", "example-02", "loop-a"));
    symlinkSync("loop-a", path.join(d, "wafers", "example-02", "loop-b"));
    inner = await checkData(d, "2026-01-01");
  });
  afterAll(() => rmSync(innerRoot, { recursive: true, force: true }));
  const at = (file: string) => inner.problems.find((p) => p.file === file);

  it("a link to a folder outside the data folder: named, with its target and why", () => {
    const p = at("wafers/example-01/transport");
    expect(p, JSON.stringify(inner.problems.map(formatProblem))).toBeDefined();
    expect(formatProblem(p!)).toMatch(/^wafers\/example-01\/transport: warning: symbolic link skipped: it leads to a folder outside the data folder/);
    expect(p!.found).toContain(path.join(innerRoot, "drive", "transport"));
    // The pattern's error is still there (the wafer has no sweeps), and points at the link.
    const e = inner.problems.find((q) => q.file === "wafers/example-01/wafer.md" && q.message === "file pattern matches no file");
    expect(e?.fix).toMatch(/symbolic link wafers\/example-01\/transport was skipped: see its warning/);
  });

  it("a link to a folder inside the data folder, a dangling link and a loop: each named with its reason", () => {
    expect(
      inner.problems.filter((p) => p.message.includes("does not match")),
      "the second wafer reads",
    ).toEqual([]);
    expect(formatProblem(at("wafers/example-02/transport")!)).toMatch(
      /symbolic link skipped: it leads to a folder, and links to folders inside a wafer folder are not followed.*found a link to "store\/transport"/,
    );
    expect(formatProblem(at("wafers/example-02/gone.csv")!)).toMatch(/symbolic link skipped: it is dangling.*"nowhere\.csv"/);
    expect(formatProblem(at("wafers/example-02/loop-a")!)).toMatch(/symbolic link skipped: it is a loop of links/);
    for (const p of inner.problems.filter((q) => q.message.startsWith("symbolic link skipped"))) expect(p.severity).toBe("warning");
  });
});
