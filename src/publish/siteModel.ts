/**
 * The site-wide pages as plain data for the templates: index rows, run pages,
 * trends, targets, changes; and what each wafer page shows beside its wafer
 * (waferPageExtras). Built once per build from the wafer outcomes (slim:
 * figures only, no bulk arrays).
 */
import { siteUrl } from "./siteUrl.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { RunNotes } from "../validate/load/site.ts";
import { formatProblem, type Problem } from "../model/problem.ts";
import { METRIC_BY_KEY } from "../model/metrics.ts";
import { formatValue } from "../model/format.ts";
import { renderNotes } from "./markdown.ts";
import { type Verdict, VERDICT_RANK } from "../judge/verdict.ts";
import type { Targets } from "../validate/targets.ts";
import type { DataHistory } from "../validate/load/history.ts";
import { trendsModel } from "./trends.ts";
import { targetsPageModel } from "./targetsPage.ts";
import { changesModel, waferHistoryModel } from "./history.ts";
import { runComparisons } from "./runSummary.ts";
import { decisionModel } from "./decisionSection.ts";
import { relationModel } from "./relationData.ts";
import { runChart } from "./runChart.ts";

/** Site-wide inputs beyond the wafers: the targets in force and the data repository's history. */
export interface SiteExtras {
  targets?: Targets;
  history?: DataHistory | null;
}

/** Wafers in growth order (then by folder): the order of the index, run pages, neighbours and exports. */
export function sortOutcomes(outcomes: readonly WaferOutcome[]): WaferOutcome[] {
  return [...outcomes].sort((a, b) => (a.record?.grown ?? "").localeCompare(b.record?.grown ?? "") || a.folder.localeCompare(b.folder));
}

/**
 * What a wafer page shows besides the wafer's own outcome: previous/next wafer
 * in its run (growth order), the breadcrumb trail and the wafer's history. With
 * the outcome, the page's code and the base path, this is everything the page
 * depends on (the page fingerprint hashes exactly these).
 */
export function waferPageExtras(sorted: readonly WaferOutcome[], basePath: string, history: DataHistory | null) {
  const byRun = new Map<string, string[]>();
  for (const o of sorted) if (o.record?.run) (byRun.get(o.record.run) ?? byRun.set(o.record.run, []).get(o.record.run)!).push(o.folder);
  const neighbours = new Map<string, { prev?: string; next?: string }>();
  for (const list of byRun.values()) list.forEach((id, i) => neighbours.set(id, { prev: list[i - 1], next: list[i + 1] }));
  return new Map(
    sorted.map((o) => {
      const run = o.record?.run;
      const page = `/wafers/${o.folder}/`;
      return [
        o.folder,
        {
          ...neighbours.get(o.folder),
          history: waferHistoryModel(history, o.folder, historyInput(o)),
          crumbs: [
            { label: "Wafers", href: siteUrl("", page, basePath) },
            ...(run ? [{ label: `Run ${run}`, href: siteUrl(`runs/${run}/`, page, basePath) }] : []),
            { label: o.folder },
          ],
        },
      ];
    }),
  );
}

/** A wafer as the history re-judges it: today's figures, its grade, waivers and whether it has input errors. */
function historyInput(o: WaferOutcome) {
  return {
    values: o.values,
    grade: o.record?.grade,
    waivers: o.record?.waivers ?? [],
    hasErrors: o.judgement.verdict === "error",
    findings: o.judgement.findings.map((f) => f.check),
  };
}

/** Metrics shown as columns of the index table. */
export const INDEX_METRICS = ["peak_mobility", "density_at_peak_mobility", "turn_on_voltage"];

export interface SiteMeta {
  title: string;
  lab?: string;
  version: string;
  /** The one build-time stamp in the output (see docs/formats.md, Output). */
  builtAt: string;
  basePath: string;
  dataCommit?: string | null;
}

/** The wafer's reactor: its own record's, else its run notes' (one rule for pages, trends and exports). */
export function reactorOf(o: WaferOutcome, runs: ReadonlyMap<string, RunNotes>): string {
  return o.record?.reactor ?? runs.get(o.record?.run ?? "")?.meta.reactor ?? "";
}

export function buildSiteModel(outcomes: WaferOutcome[], runs: Map<string, RunNotes>, siteProblems: Problem[], meta: SiteMeta, extras: SiteExtras = {}) {
  const sorted = sortOutcomes(outcomes);
  const history = extras.history ?? null;
  const index = sorted.map((o) => ({
    id: o.folder,
    run: o.record?.run ?? "",
    grown: o.record?.grown ?? "",
    grade: o.judgement.grade,
    reactor: reactorOf(o, runs),
    verdict: o.judgement.verdict,
    /** Sorts the verdict column by severity (pass < … < error), not alphabetically. */
    verdictRank: VERDICT_RANK[o.judgement.verdict],
    firstReason: o.judgement.reasons[0] ?? "",
    metrics: INDEX_METRICS.map((k) => {
      const m = o.judgement.metrics.find((x) => x.key === k);
      return { key: k, text: m ? formatValue(m.value, m.spec) : "—", sort: m?.value ?? "", verdict: m?.verdict ?? "unmeasured" };
    }),
  }));
  const runIds = [...new Set([...sorted.flatMap((o) => (o.record?.run ? [o.record.run] : [])), ...runs.keys()])].sort();
  const judged = (o: WaferOutcome) => Object.fromEntries(o.judgement.metrics.map((m) => [m.key, m.value]));
  const comparisons = runComparisons(
    runIds.map((id) => ({
      id,
      started: runs.get(id)?.meta.started,
      wafers: sorted.filter((o) => o.record?.run === id).map((o) => ({ grown: o.record?.grown ?? "", values: judged(o) })),
    })),
  );
  const runPages = runIds.map((id) => {
    const notes = runs.get(id);
    const members = index.filter((w) => w.run === id);
    return {
      comparison: comparisons.get(id)!,
      id,
      crumbs: [{ label: "Runs", href: siteUrl("runs/", `/runs/${id}/`, meta.basePath) }, { label: id }],
      meta: Object.entries(notes?.meta ?? {}).map(([k, v]) => ({ key: k, value: v })),
      notesHtml: renderNotes(notes?.notes ?? ""),
      wafers: members,
      verdictCounts: countVerdicts(members.map((m) => m.verdict)),
      mobilityChart: runChart(
        id,
        sorted.filter((o) => o.record?.run === id),
        meta.basePath,
      ),
    };
  });
  const failing = index.filter((w) => w.verdict === "fail" || w.verdict === "error" || w.verdict === "incomplete");
  return {
    meta,
    trends: trendsModel(
      index.map((w, i) => ({ id: w.id, grown: w.grown, run: w.run, reactor: w.reactor, grade: w.grade, verdict: w.verdict, values: judged(sorted[i]) })),
      extras.targets,
      meta.basePath,
    ),
    targets: targetsPageModel(extras.targets),
    changes: changesModel(
      history,
      sorted.map((o) => o.folder),
      meta.basePath,
      sorted.map((o) => ({ id: o.folder, ...historyInput(o) })),
    ),
    index,
    relation: relationModel(sorted, (o) => reactorOf(o, runs)),
    runs: runPages,
    failing,
    decisionConflicts: sorted.flatMap((o) => {
      const d = decisionModel(o);
      return d?.conflict ? [{ id: o.folder, verdict: o.judgement.verdict, conflict: d.conflict }] : [];
    }),
    indexMetrics: INDEX_METRICS.map((k) => ({ key: k, label: METRIC_BY_KEY.get(k)!.label })),
    verdictCounts: countVerdicts(index.map((w) => w.verdict)),
    siteProblems: siteProblems.map((p) => ({ severity: p.severity, text: formatProblem(p) })),
  };
}

export function countVerdicts(vs: Verdict[]): { verdict: Verdict; count: number }[] {
  const counts = new Map<Verdict, number>();
  for (const v of vs) counts.set(v, (counts.get(v) ?? 0) + 1);
  return [...counts.entries()].sort((a, b) => VERDICT_RANK[b[0]] - VERDICT_RANK[a[0]]).map(([verdict, count]) => ({ verdict, count }));
}

export type SiteModel = ReturnType<typeof buildSiteModel>;
