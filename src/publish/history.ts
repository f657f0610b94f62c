/**
 * Page models of the audit trail: /changes/ (commits that touched the data
 * folder, with the wafers each affected) and, per wafer, its own commits and
 * its verdicts under every version of targets.yaml since it was recorded.
 */
import { siteUrl } from "./siteUrl.ts";
import type { DataHistory } from "../read/history.ts";
import type { GitCommit } from "../read/gitHistory.ts";
import { verdictsOverTime, type WaferForHistory } from "../judge/verdictHistory.ts";

/** "2025-03-04T10:20:30+01:00" → "2025-03-04 10:20". */
export function shortDate(iso: string): string {
  return iso.replace("T", " ").slice(0, 16);
}

/** Wafer ids whose folder a commit touched (data-folder-relative paths `wafers/<id>/…`). */
export function affectedWafers(c: Pick<GitCommit, "dataFiles">): string[] {
  const ids = new Set<string>();
  for (const f of c.dataFiles) {
    const m = /^wafers\/([^/]+)\//.exec(f);
    if (m) ids.add(m[1]);
  }
  return [...ids].sort();
}

function commitRow(c: GitCommit, known: Set<string>, basePath: string) {
  return {
    hash: c.hash,
    shortHash: c.shortHash,
    date: shortDate(c.date),
    author: c.author,
    subject: c.subject,
    files: c.dataFiles,
    targetsChanged: c.dataFiles.includes("targets.yaml"),
    wafers: affectedWafers(c).map((id) => ({ id, href: known.has(id) ? siteUrl(`wafers/${id}/`, "/changes/", basePath) : "" })),
  };
}

export function changesModel(history: DataHistory | null, waferIds: readonly string[], basePath: string) {
  const known = new Set(waferIds);
  return {
    available: history !== null,
    head: history?.head ?? null,
    commits: (history?.commits ?? []).map((c) => commitRow(c, known, basePath)),
  };
}

/** The history block of one wafer page. */
export function waferHistoryModel(history: DataHistory | null, waferId: string, w: WaferForHistory) {
  if (!history) return { available: false, commits: [], verdicts: [], recorded: "" };
  const prefix = `wafers/${waferId}/`;
  const mine = history.commits.filter((c) => c.dataFiles.some((f) => f.startsWith(prefix)));
  const recorded = mine.at(-1)?.committedAt; // commits are newest first: the oldest one is when the wafer was recorded (as firstRecorded)
  return {
    available: true,
    recorded: recorded ? shortDate(recorded) : "",
    commits: mine.map((c) => ({ shortHash: c.shortHash, hash: c.hash, date: shortDate(c.date), author: c.author, subject: c.subject, files: c.dataFiles.filter((f) => f.startsWith(prefix)).map((f) => f.slice(prefix.length)) })),
    verdicts: verdictsOverTime(w, history.targetsVersions, recorded).map((v) => ({ ...v, date: shortDate(v.date), reasons: v.reasons, note: v.note ?? "" })),
  };
}
