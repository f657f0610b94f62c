/**
 * The templates render strictly: .eleventy.js turns Nunjucks' autoescape and
 * throwOnUndefined on, so a page model that leaves a printed field undefined
 * (or null) fails the build instead of printing an empty cell or a link to
 * "runs//". Every site build in the tests (the demo, the malformed-input
 * corpus) renders this way; this file pins the options and renders the wafer
 * page of a wafer whose record could not be read (no run, grade from the
 * targets, no reactor or grown date), the case that used to print undefined.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { describe, expect, it } from "vitest";
import { renderTemplates } from "../../src/cli/render.ts";
import { PACKAGE_ROOT } from "../../src/cli/paths.ts";
import { waferPageModel } from "../../src/publish/waferPage.ts";
import { waferPageExtras } from "../../src/publish/siteModel.ts";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";
import { useTempDir } from "../helpers/tempDir.ts";

const TARGETS = targetsFrom('default_grade: test\ngrades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)" }\n');
const META = { title: "Strict", version: "test", builtAt: "2025-06-01T12:00:00Z", basePath: "", dataCommit: null };

/** A wafer whose wafer.md failed validation: no record, no analysis, one input error. */
function unreadWafer() {
  const o = makeOutcome({ id: "NOREC", devices: {}, error: true }, TARGETS);
  return {
    ...o,
    record: undefined,
    analysis: undefined,
    problems: [{ severity: "error" as const, wafer: "NOREC", file: "wafers/NOREC/wafer.md", message: "front matter is not closed" }],
  } as unknown as typeof o;
}

async function renderWafer(page: Record<string, unknown>, out: string): Promise<string> {
  await renderTemplates(path.join(PACKAGE_ROOT, "templates", "wafer.njk"), out, { meta: META, wafers: [page] });
  return fs.readFile(path.join(out, "wafers", String(page.id), "index.html"), "utf8");
}

const tmp = useTempDir("strict");

describe("strict Nunjucks", () => {
  it(".eleventy.js keeps autoescape on and throws on an undefined output", async () => {
    const { default: eleventyConfig } = (await import(pathToFileURL(path.join(PACKAGE_ROOT, ".eleventy.js")).href)) as {
      default: (config: unknown) => unknown;
    };
    let options: Record<string, unknown> = {};
    const stub = {
      setNunjucksEnvironmentOptions: (o: Record<string, unknown>) => (options = o),
      addPassthroughCopy: () => {},
      setQuietMode: () => {},
      ignores: new Set<string>(),
      setUseGitIgnore: () => {},
    };
    eleventyConfig(stub);
    expect(options).toMatchObject({ autoescape: true, throwOnUndefined: true });
  });

  it("renders the page of a wafer whose record failed, and refuses a model with a printed field missing", async () => {
    const out = tmp();
    const o = unreadWafer();
    const page = { ...waferPageModel(o), ...waferPageExtras([o], "", null).get("NOREC")!, fingerprint: "f" };
    const html = await renderWafer(page, path.join(out, "ok"));
    expect(html).toContain("Record not read (see the input problems below)");
    expect(html).not.toContain("runs//");
    expect(html).not.toMatch(/undefined|null</);
    // The negative control: the same page without its grade (printed unguarded) is a render error, not an empty cell.
    const { grade: _grade, ...withoutGrade } = page;
    const err = await renderWafer(withoutGrade, path.join(out, "bad")).then(
      () => null,
      (e: unknown) => e,
    );
    const chain: string[] = [];
    for (let e = err as { message?: string; cause?: unknown; originalError?: unknown } | undefined; e; e = (e.originalError ?? e.cause) as typeof e)
      chain.push(String(e.message));
    expect(chain.join(" | ")).toMatch(/attempted to output null or undefined value/);
  });
});
