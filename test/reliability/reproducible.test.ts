/**
 * Issue 13 §10: SOURCE_DATE_EPOCH (the reproducible-builds convention,
 * https://reproducible-builds.org/specs/source-date-epoch/: whole seconds
 * since 1970-01-01T00:00:00Z) sets the build time the site-wide pages show, so
 * two builds of the same inputs — from copies at different paths, at
 * different times — are byte-identical, file for file. A malformed value is a
 * usage error (exit 2). The epoch conversions below were worked by hand
 * (1700000000 s = 19675 days + 80000 s; day 19675 is 2023-11-14).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { buildStamp } from "../../src/cli/buildStamp.ts";
import { cli, healthyData, siteFiles } from "./outputHelpers.ts";

const tempDir = useTempDir("repro");
const clock = () => new Date("2026-03-04T05:06:07.890Z");

describe("buildStamp", () => {
  it("uses SOURCE_DATE_EPOCH when set, the clock otherwise, and refuses malformed values", () => {
    const stamp = (v?: string) => {
      const s = buildStamp({ SOURCE_DATE_EPOCH: v }, clock);
      return "error" in s ? s.error : s.stamp();
    };
    expect(stamp(undefined)).toBe("2026-03-04T05:06:07Z");
    expect(stamp("")).toBe("2026-03-04T05:06:07Z");
    expect(stamp("1700000000")).toBe("2023-11-14T22:13:20Z");
    expect(stamp("0")).toBe("1970-01-01T00:00:00Z");
    for (const bad of ["1.5", "-1", "abc", "1e9", " 17", "253402300800"])
      expect(stamp(bad), bad).toMatch(/^SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01T00:00:00Z/);
  });
});

describe("two builds with SOURCE_DATE_EPOCH set", () => {
  it("are byte-identical, file for file, and the footer shows that time; a malformed value exits 2", async () => {
    const env = { SOURCE_DATE_EPOCH: "1700000000" };
    const a = await healthyData(path.join(tempDir(), "data-a"));
    const b = await healthyData(path.join(tempDir(), "elsewhere", "data-b"));
    const ra = await cli(["build", "--data", a, "--out", path.join(tempDir(), "site-a")], { env });
    // Later by more than the stamp's one-second resolution.
    await new Promise((r) => setTimeout(r, 1100));
    const rb = await cli(["build", "--data", b, "--out", path.join(tempDir(), "elsewhere", "site-b")], { env });
    expect([ra.code, rb.code]).toEqual([0, 0]);
    const fa = await siteFiles(path.join(tempDir(), "site-a"));
    expect(fa.size).toBeGreaterThan(10);
    expect(await siteFiles(path.join(tempDir(), "elsewhere", "site-b"))).toEqual(fa);
    expect(await fs.readFile(path.join(tempDir(), "site-a", "index.html"), "utf8")).toContain("<p>Built 2023-11-14T22:13:20Z by waferbook");
    const bad = await cli(["build", "--data", a, "--out", path.join(tempDir(), "site-c")], { env: { SOURCE_DATE_EPOCH: "yesterday" } });
    expect(bad.code).toBe(2);
    expect(bad.stderr).toBe(
      'waferbook: SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01T00:00:00Z (at most 253402300799), found "yesterday"; unset it to show the build\'s own time\n',
    );
    await expect(fs.stat(path.join(tempDir(), "site-c"))).rejects.toThrow();
  }, 120_000);
});
