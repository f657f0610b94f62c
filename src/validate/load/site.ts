/**
 * Loads the site-wide inputs: targets.yaml, analysis.yaml, run notes, and the
 * list of wafer folders. Wafer folders are loaded one by one elsewhere so a
 * broken wafer never stops the others.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { InputError, type Problem } from "../../model/problem.ts";
import { applySettings, DEFAULT_SETTINGS, type AnalysisSettings } from "../settings.ts";
import { validateTargets, type Targets } from "../targets.ts";
import { WAFER_ID } from "../waferSchema.ts";
import { siteNameProblem } from "../siteNames.ts";
import { decodeText, readDataBytes } from "../../read/dataFiles.ts";
import { lineOfField, readFrontMatter, readYaml } from "../../read/frontMatter.ts";
import { fileInfo, type RawFileInfo } from "../../read/fileInfo.ts";
import { linkedWaferFolder } from "../../read/linkedFolder.ts";

export interface RunNotes {
  id: string;
  file: string;
  meta: Record<string, string>;
  notes: string;
}

export interface SiteInputs {
  targets?: Targets;
  settings: AnalysisSettings;
  /** The keys analysis.yaml sets, as written (for provenance: "site" rather than "default"). */
  settingOverrides: Record<string, unknown>;
  runs: Map<string, RunNotes>;
  waferFolders: string[];
  /** Every name in wafers/ as read (folders or not, valid ids or not), for the letter-case twin check; empty without a wafers folder. */
  waferListing: string[];
  files: RawFileInfo[];
  problems: Problem[];
}

async function exists(p: string): Promise<boolean> {
  return fs.stat(p).then(
    () => true,
    () => false,
  );
}

export async function loadSiteInputs(dataDir: string): Promise<SiteInputs> {
  const out: SiteInputs = { settings: DEFAULT_SETTINGS, settingOverrides: {}, runs: new Map(), waferFolders: [], waferListing: [], files: [], problems: [] };
  const catchInto = async (fn: () => Promise<void>) => {
    try {
      await fn();
    } catch (err) {
      if (err instanceof InputError) out.problems.push(...err.problems);
      else throw err;
    }
  };
  if (!(await exists(dataDir))) {
    out.problems.push({
      severity: "error",
      file: dataDir,
      message: "data folder not found",
      expected: "a folder with wafers/ and targets.yaml",
      found: "nothing at that path",
      fix: "pass --data DIR pointing at your data folder",
    });
    return out;
  }
  await catchInto(async () => {
    const abs = path.join(dataDir, "targets.yaml");
    if (!(await exists(abs))) {
      throw new InputError({
        file: "targets.yaml",
        message: "targets file is missing",
        expected: "data/targets.yaml with default_grade and grades",
        found: "no file",
        fix: "create it; see docs/formats.md, section Targets",
      });
    }
    const f = await readDataBytes(dataDir, abs);
    out.files.push(fileInfo(f.rel, f.bytes, "targets"));
    const text = decodeText(f);
    out.targets = validateTargets(readYaml(text, f.rel), f.rel, text);
  });
  await catchInto(async () => {
    const abs = path.join(dataDir, "analysis.yaml");
    if (!(await exists(abs))) return;
    const f = await readDataBytes(dataDir, abs);
    out.files.push(fileInfo(f.rel, f.bytes, "settings"));
    const text = decodeText(f);
    const raw = readYaml(text, f.rel) ?? {};
    out.settings = applySettings(DEFAULT_SETTINGS, raw, { file: f.rel, field: "", line: 1, lineOf: (k) => lineOfField("\n" + text, k, 1) });
    out.settingOverrides = raw as Record<string, unknown>;
  });
  const runsDir = path.join(dataDir, "runs");
  if (await exists(runsDir)) {
    for (const name of (await fs.readdir(runsDir)).sort()) {
      if (!name.endsWith(".md")) continue;
      await catchInto(async () => {
        const id = name.slice(0, -3);
        const f = await readDataBytes(dataDir, path.join(runsDir, name));
        if (!WAFER_ID.test(id))
          throw new InputError({
            file: f.rel,
            message: "run file name is not a valid id",
            expected: 'letters, digits, ".", "-", "_"',
            found: JSON.stringify(id),
            fix: "rename the file",
          });
        const reserved = siteNameProblem(id, "run", { file: f.rel, rename: "file" });
        if (reserved) throw new InputError(reserved);
        out.files.push(fileInfo(f.rel, f.bytes, "run"));
        const doc = readFrontMatter(decodeText(f), f.rel);
        const meta: Record<string, string> = {};
        for (const [k, v] of Object.entries((doc.data ?? {}) as Record<string, unknown>))
          meta[k] = v instanceof Date ? v.toISOString().slice(0, 10) : String(v);
        out.runs.set(id, { id, file: f.rel, meta, notes: doc.body });
      });
    }
  }
  const wafersDir = path.join(dataDir, "wafers");
  if (!(await exists(wafersDir))) {
    out.problems.push({
      severity: "error",
      file: "wafers",
      message: "no wafers folder",
      expected: "data/wafers/<wafer-id>/wafer.md",
      found: "nothing",
      fix: "add a wafer; see docs/formats.md",
    });
    return out;
  }
  // Ids differing only by letter case are both kept and both marked `error` by loadWafer, so neither wafer silently disappears.
  const entries = await fs.readdir(wafersDir, { withFileTypes: true });
  out.waferListing = entries.map((e) => e.name);
  for (const e of entries.sort((a, b) => a.name.localeCompare(b.name))) {
    if (e.isSymbolicLink()) {
      // Followed when it stays inside the data folder; otherwise skipped with a warning saying why (linkedFolder.ts).
      const skipped = await linkedWaferFolder(dataDir, e.name);
      if (skipped) {
        out.problems.push(skipped);
        continue;
      }
    } else if (!e.isDirectory()) continue;
    if (!WAFER_ID.test(e.name)) {
      out.problems.push({
        severity: "error",
        file: `wafers/${e.name}`,
        message: "wafer folder name is not a valid id",
        expected: 'letters, digits, ".", "-", "_" (no "..")',
        found: JSON.stringify(e.name),
        fix: "rename the folder",
      });
      continue;
    }
    const reserved = siteNameProblem(e.name, "wafer", { file: `wafers/${e.name}`, rename: "folder (and the wafer: field)" });
    if (reserved) {
      out.problems.push(reserved);
      continue;
    }
    out.waferFolders.push(e.name);
  }
  return out;
}
