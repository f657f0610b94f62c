/**
 * Where each measurement condition of a device's sweeps came from, for the
 * wafer page (appendix, per device): the file's own `# key:` line, a wafer.md
 * reading rule that found it in the file's name or a preamble line, a fixed
 * value written in wafer.md, or the file's current column
 * (src/model/conditionSource.ts). One line per condition, not per sweep: the
 * sweeps that share a source are counted together, and only when a device's
 * sweeps differ are the files of each source named. Page weight stays a few
 * lines per device however many sweeps it has.
 */
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { ConditionSource } from "../model/conditionSource.ts";

export interface ConditionLine {
  /** "gate voltage (field sweeps)", "temperature"… */
  label: string;
  /** The values over the sweeps that give it: "0.35 V" or "−0.2 … 0.6 V". */
  values: string;
  /** One entry per source, in order of first use: what it is and which sweeps use it. */
  sources: { text: string; rule?: string; ruleAt?: string; sweeps: string }[];
  /** Sweeps that do not give the condition (temperature and current are optional): "3 sweeps: a.dat, b.dat, c.dat", or "". */
  missing: string;
}

type Key = "gate" | "field" | "temperature" | "current" | "field_range";
const CONDITIONS: { key: Key; label: string; only?: "field" | "gate" }[] = [
  { key: "field_range", label: "field range (field sweeps)", only: "field" },
  { key: "gate", label: "gate voltage (field sweeps)", only: "field" },
  { key: "field", label: "field (gate sweeps)", only: "gate" },
  { key: "temperature", label: "temperature" },
  { key: "current", label: "source current" },
];

/**
 * A condition's value, or the range lo … hi, with its unit (SI in, 4 significant
 * digits at most); currents in nA, µA or mA chosen by the larger magnitude.
 */
export function conditionValue(key: Key, lo: number, hi = lo): string {
  const n = (x: number) => String(Number(x.toPrecision(4))).replace("-", "−");
  const a = Math.max(Math.abs(lo), Math.abs(hi));
  const [unit, factor] =
    key === "gate"
      ? ["V", 1]
      : key === "field" || key === "field_range"
        ? ["T", 1]
        : key === "temperature"
          ? ["K", 1]
          : a < 1e-6
            ? ["nA", 1e9]
            : a < 1e-3
              ? ["µA", 1e6]
              : ["mA", 1e3];
  return lo === hi ? `${n(lo * factor)} ${unit}` : `${n(lo * factor)} … ${n(hi * factor)} ${unit}`;
}

function sourceText(s: ConditionSource, lines: Set<number>): string {
  switch (s.origin) {
    case "file-line":
      return `the file's own “# ${s.key}:” line${lines.size === 1 ? ` (line ${[...lines][0]})` : ""}`;
    case "rule-file-name":
      return "the file name, by reading rule";
    case "rule-line":
      return `a line above the column names${lines.size === 1 ? ` (line ${[...lines][0]})` : ""}, by reading rule`;
    case "record-value":
      return "a fixed value in the wafer record";
    case "file-column":
      return s.span ? `the file's ${s.column} column` : `the mean of the file's ${s.column ?? "I"} column`;
  }
}

const base = (file: string) => file.split("/").at(-1) ?? file;

function sweepList(files: string[], all: number): string {
  const count = `${files.length} sweep${files.length === 1 ? "" : "s"}`;
  if (files.length === all) return all === 1 ? "its one sweep" : all === 2 ? "both sweeps" : `all ${count}`;
  const named = files.slice(0, 4).map(base).join(", ");
  return `${count}: ${named}${files.length > 4 ? ` and ${files.length - 4} more` : ""}`;
}

/** The device's condition lines; empty when its sweeps carry no conditions (a device analysed before they were recorded). */
export function deviceConditions(d: Pick<DeviceAnalysis, "conditions">): ConditionLine[] {
  const lines: ConditionLine[] = [];
  for (const c of CONDITIONS) {
    const sweeps = (d.conditions ?? []).filter((s) => !c.only || s.kind === c.only);
    if (sweeps.length === 0) continue;
    const groups = new Map<string, { first: ConditionSource; files: string[]; lines: Set<number> }>();
    const missing: string[] = [];
    const values: number[] = [];
    for (const s of sweeps) {
      const src = s.sources.find((x) => x.key === c.key);
      if (!src) {
        missing.push(s.file);
        continue;
      }
      if (src.value !== undefined) values.push(src.value);
      if (src.span) values.push(...src.span);
      const id = `${src.origin}|${src.rule ?? ""}|${src.ruleAt ?? ""}|${src.column ?? ""}`;
      const g = groups.get(id) ?? { first: src, files: [], lines: new Set<number>() };
      g.files.push(s.file);
      if (src.line !== undefined) g.lines.add(src.line);
      groups.set(id, g);
    }
    if (groups.size === 0) continue;
    const lo = Math.min(...values);
    const hi = Math.max(...values);
    lines.push({
      label: c.label,
      values: values.length === 0 ? "" : conditionValue(c.key, lo, hi),
      sources: [...groups.values()].map((g) => ({
        text: sourceText(g.first, g.lines),
        rule: g.first.rule,
        ruleAt: g.first.ruleAt,
        sweeps: sweepList(g.files, sweeps.length),
      })),
      missing: missing.length ? sweepList(missing, sweeps.length) : "",
    });
  }
  return lines;
}
