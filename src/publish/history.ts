/**
 * Page models of the audit trail: /changes/ (commits that touched the data
 * folder, with the wafers each affected) and, per wafer, its own commits and
 * its verdicts under every version of targets.yaml since it was recorded.
 */
import { siteUrl } from "./siteUrl.ts";
import { formatValue } from "../model/format.ts";
import { METRIC_BY_KEY } from "../model/metrics.ts";
import type { Target } from "../validate/targets.ts";
import type { DataHistory } from "../validate/load/history.ts";
import type { GitCommit } from "../read/gitHistory.ts";
import { verdictsOverTime, type WaferForHistory } from "../judge/verdictHistory.ts";
import { targetsChange } from "../judge/targetsChange.ts";
import type { DecisionCommit } from "../validate/load/decisionCommits.ts";

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

/** A limit in words, in the metric's unit: "≥ 1.00×10⁵ cm²/(V s), guard 5 %, required, max over devices"; "none" when absent. */
export function describeLimit(t: Target | undefined): string {
  if (!t) return "none";
  const spec = METRIC_BY_KEY.get(t.metric);
  const f = (v: number) => (spec ? formatValue(v, spec) : String(v));
  const range = t.min !== undefined && t.max !== undefined ? `${f(t.min)} … ${f(t.max)}` : t.min !== undefined ? `≥ ${f(t.min)}` : `≤ ${f(t.max!)}`;
  return [range, t.guardText ? `guard ${t.guardText}` : "", t.required ? "required" : "", t.aggregate !== "mean" ? `${t.aggregate} over devices` : ""]
    .filter(Boolean)
    .join(", ");
}

/** Limit-by-limit change and verdict flips of a commit that changed targets.yaml (null for other commits). */
function targetsRow(c: GitCommit, history: DataHistory, wafers: readonly (WaferForHistory & { id: string })[], known: Set<string>, basePath: string) {
  if (!c.dataFiles.includes("targets.yaml")) return null;
  const i = history.targetsVersions.findIndex((v) => v.hash === c.hash);
  if (i < 0) return null;
  const t = targetsChange(history.targetsVersions[i + 1], history.targetsVersions[i], wafers);
  return {
    note: t.note ?? "",
    first: i === history.targetsVersions.length - 1,
    limits: t.limits.map((l) => ({ grade: l.grade, metric: l.metric, before: describeLimit(l.before), after: describeLimit(l.after) })),
    other: t.other,
    flips: t.flips.map((f) => ({ ...f, href: known.has(f.id) ? siteUrl(`wafers/${f.id}/`, "/changes/", basePath) : "" })),
  };
}

/** Decisions a commit recorded (from DataHistory.decisions), for the changes page. */
function decisionsIn(c: GitCommit, history: DataHistory | null, known: Set<string>, basePath: string) {
  const out: { id: string; href: string }[] = [];
  for (const [id, d] of history?.decisions ?? [])
    if (d.hash === c.hash) out.push({ id, href: known.has(id) ? siteUrl(`wafers/${id}/`, "/changes/", basePath) : "" });
  return out.sort((a, b) => a.id.localeCompare(b.id));
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

/**
 * The /changes/ page. `wafers`: today's figures of every wafer, re-judged under the targets before
 * and after each targets commit to list the wafers whose verdict that commit changed.
 */
export function changesModel(
  history: DataHistory | null,
  waferIds: readonly string[],
  basePath: string,
  wafers: readonly (WaferForHistory & { id: string })[] = [],
) {
  const known = new Set(waferIds);
  return {
    available: history !== null && !history.failure,
    /** Why the history could not be read (shown as a warning), or "". */
    warning: history?.failure ?? "",
    head: history?.head ?? null,
    commits: (history?.commits ?? []).map((c) => ({
      ...commitRow(c, known, basePath),
      targets: history ? targetsRow(c, history, wafers, known, basePath) : null,
      decisions: decisionsIn(c, history, known, basePath),
    })),
  };
}

/** The history block of one wafer page. */
export function waferHistoryModel(history: DataHistory | null, waferId: string, w: WaferForHistory) {
  if (!history || history.failure) return { available: false, warning: history?.failure ?? "", commits: [], verdicts: [], recorded: "", decision: null };
  const prefix = `wafers/${waferId}/`;
  const mine = history.commits.filter((c) => c.dataFiles.some((f) => f.startsWith(prefix)));
  const recorded = mine.at(-1)?.committedAt; // commits are newest first: the oldest one is when the wafer was recorded (as firstRecorded)
  return {
    available: true,
    warning: "",
    recorded: recorded ? shortDate(recorded) : "",
    commits: mine.map((c) => ({
      shortHash: c.shortHash,
      hash: c.hash,
      date: shortDate(c.date),
      author: c.author,
      subject: c.subject,
      files: c.dataFiles.filter((f) => f.startsWith(prefix)).map((f) => f.slice(prefix.length)),
    })),
    verdicts: verdictsOverTime(w, history.targetsVersions, recorded).map((v) => ({ ...v, date: shortDate(v.date), reasons: v.reasons, note: v.note ?? "" })),
    decision: decisionCommitModel(history.decisions?.get(waferId)),
  };
}

/** The commit that recorded a wafer's decision, as the wafer page shows it (null without a decision or history). */
export function decisionCommitModel(c: DecisionCommit | undefined) {
  if (!c) return null;
  return {
    hash: c.hash ?? "",
    shortHash: c.shortHash ?? "",
    date: c.committedAt ? shortDate(c.committedAt) : "",
    committer: c.committer ?? "",
    author: c.author ?? "",
    subject: c.subject ?? "",
    note: c.note ?? "",
  };
}
