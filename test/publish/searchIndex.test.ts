import MiniSearch, { type AsPlainObject } from "minisearch";
import { describe, expect, it } from "vitest";
import type { WaferOutcome } from "../../src/judge/outcome.ts";
import { type SEARCH_OPTIONS, searchDocuments, searchIndexJson } from "../../src/publish/searchIndex.ts";

// A minimal outcome: only the fields the search index reads.
const outcome = (folder: string, run: string, notes: string, verdict: string, reasons: string[]) =>
  ({ folder, record: { run, notes }, judgement: { grade: "qubit", verdict, reasons } }) as unknown as WaferOutcome;

describe("site search index", () => {
  const docs = searchDocuments(
    [
      outcome("ZX-0101", "ZX01-A", "Haze seen near the **flat**; `probe` card swapped.", "fail", ["Peak Hall mobility below the minimum"]),
      outcome("ZX-0102", "ZX01-A", "", "pass", []),
    ],
    new Map([["ZX01-A", { id: "ZX01-A", file: "runs/ZX01-A.md", meta: {}, notes: "Susceptor recoated before this run." }]]),
  );

  it("has one document per wafer and per run, with site-relative links", () => {
    expect(docs.map((d) => d.id)).toEqual(["wafer:ZX-0101", "wafer:ZX-0102", "run:ZX01-A"]);
    expect(docs[0].href).toBe("wafers/ZX-0101/");
    expect(docs[2].href).toBe("runs/ZX01-A/");
    expect(docs[0].notes).toBe("Haze seen near the flat ; probe card swapped.");
  });

  it("round-trips through JSON and finds notes, reasons and runs by the field that matched", () => {
    const data = JSON.parse(searchIndexJson(docs)) as { options: typeof SEARCH_OPTIONS; index: AsPlainObject };
    const ms = MiniSearch.loadJS(data.index, data.options);
    const haze = ms.search("haze");
    expect(haze.map((h) => h.id)).toEqual(["wafer:ZX-0101"]);
    expect(haze[0].match.haze).toEqual(["notes"]);
    expect(ms.search("mobility")[0].match.mobility).toEqual(["reasons"]);
    expect(ms.search("susceptor").map((h) => h.href)).toEqual(["runs/ZX01-A/"]);
    expect(ms.search("ZX01-A").length).toBe(3);
    expect(ms.search("zirconium")).toEqual([]);
  });
});
