/**
 * The site search index: one MiniSearch document per wafer (id, run, grade,
 * verdict, reasons, notes) and per growth run (id, notes), serialised at build
 * time into assets/search-index.js and loaded in the browser by assets/search.js
 * with MiniSearch.loadJS. The index is a script, not a JSON file fetched by the
 * page, because browsers refuse fetch() on pages opened from disk (file://)
 * while <script src> works there. Hrefs are paths from the site root (the page
 * turns them into links, src/publish/siteUrl.ts), so the index does not depend
 * on where the site is served.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import MiniSearch from "minisearch";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { RunNotes } from "../validate/load/site.ts";

export interface SearchDoc {
  id: string;
  kind: "wafer" | "run";
  title: string;
  href: string;
  run: string;
  grade: string;
  verdict: string;
  reasons: string;
  notes: string;
}

/** Options shared by the build and the browser (loadJS needs the same ones). Reasons and notes are stored for the result snippets. */
export const SEARCH_OPTIONS = {
  fields: ["title", "run", "grade", "verdict", "reasons", "notes"],
  storeFields: ["kind", "title", "href", "run", "verdict", "reasons", "notes"],
};

/** Markdown to plain words: drops markup characters, keeps the text. */
function plain(md: string): string {
  return md
    .replace(/```[\s\S]*?```/g, " ")
    .replace(/[#*_`>|[\]()]/g, " ")
    .replace(/\s+/g, " ")
    .trim();
}

/** The documents of the index, wafers first (in folder order), then runs. */
export function searchDocuments(outcomes: WaferOutcome[], runs: Map<string, RunNotes>): SearchDoc[] {
  const wafers: SearchDoc[] = outcomes.map((o) => ({
    id: `wafer:${o.folder}`,
    kind: "wafer",
    title: o.folder,
    href: `wafers/${o.folder}/`,
    run: o.record?.run ?? "",
    grade: o.judgement.grade,
    verdict: o.judgement.verdict,
    reasons: o.judgement.reasons.join(" · "),
    notes: plain(o.record?.notes ?? ""),
  }));
  const runIds = [...new Set([...runs.keys(), ...wafers.map((w) => w.run).filter(Boolean)])].sort();
  const runDocs: SearchDoc[] = runIds.map((id) => ({
    id: `run:${id}`,
    kind: "run",
    title: id,
    href: `runs/${id}/`,
    run: id,
    grade: "",
    verdict: "",
    reasons: "",
    notes: plain(runs.get(id)?.notes ?? ""),
  }));
  return [...wafers, ...runDocs];
}

/** The serialised index: `{ options, index }`, index being MiniSearch's toJSON(). */
export function searchIndexJson(docs: SearchDoc[]): string {
  const ms = new MiniSearch<SearchDoc>(SEARCH_OPTIONS);
  ms.addAll(docs);
  return JSON.stringify({ options: SEARCH_OPTIONS, index: ms.toJSON() });
}

/** The index as a script that sets window.waferbookSearchIndex (JSON is a JavaScript expression). */
export function searchIndexScript(json: string): string {
  return `window.waferbookSearchIndex = ${json};\n`;
}

/** Writes the index (assets/search-index.js) and MiniSearch's browser build (`miniSearchBrowser`, its dist/umd/index.js) as assets/minisearch.js into the output. */
export async function writeSearch(outcomes: WaferOutcome[], runs: Map<string, RunNotes>, outDir: string, miniSearchBrowser: string): Promise<void> {
  await fs.mkdir(path.join(outDir, "assets"), { recursive: true });
  await fs.writeFile(path.join(outDir, "assets", "search-index.js"), searchIndexScript(searchIndexJson(searchDocuments(outcomes, runs))));
  await fs.copyFile(miniSearchBrowser, path.join(outDir, "assets", "minisearch.js"));
}
