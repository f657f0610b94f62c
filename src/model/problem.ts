/**
 * One error type for everything a user can get wrong: a located problem.
 *
 * A problem travels as plain data from the stage that found it to the one
 * reporter (src/cli/report.ts) and onto the affected wafer's page. It names the
 * file (relative to the data folder), the line or field, what was expected,
 * what was found, and how to fix it.
 */
export type Severity = "error" | "warning";

export interface Problem {
  severity: Severity;
  /** Path relative to the data folder, with forward slashes. */
  file: string;
  line?: number;
  column?: number;
  /** Dotted field path inside a record, e.g. `devices[0].geometry`. */
  field?: string;
  message: string;
  expected?: string;
  found?: string;
  fix?: string;
  /** Wafer this problem belongs to, when it belongs to one. */
  wafer?: string;
}

/**
 * The most characters of a problem's message, found value and field path
 * (which echo the input) that any output shows; longer text is cut and ends
 * in "…". A 20 MB header cell must not become a 20 MB line on stderr, in
 * results.json, the index, the search index and the wafer page.
 */
export const ECHO_LIMIT = 200;
/** The same for `expected` and `fix`: the program's own words, which may list names (settings, grades) from the input. */
export const HINT_LIMIT = 400;

/** Cuts text to `limit` characters (UTF-16 units, never half a surrogate pair) ending in "…". */
export function capText(text: string, limit: number = ECHO_LIMIT): string {
  if (text.length <= limit) return text;
  let head = text.slice(0, limit - 1);
  const last = head.charCodeAt(head.length - 1);
  if (last >= 0xd800 && last <= 0xdbff) head = head.slice(0, -1);
  return `${head}…`;
}

/**
 * A problem with every echoed text capped (ECHO_LIMIT, HINT_LIMIT). Applied
 * wherever problems are made or gathered (InputError, loadWafer's and the
 * site's problem lists, judgeOutcome), so no path reaches an output uncapped.
 */
export function capProblem<P extends Problem>(p: P): P {
  const long = (t: string | undefined, limit: number) => t !== undefined && t.length > limit;
  if (!long(p.message, ECHO_LIMIT) && !long(p.found, ECHO_LIMIT) && !long(p.field, ECHO_LIMIT) && !long(p.expected, HINT_LIMIT) && !long(p.fix, HINT_LIMIT))
    return p;
  const out: P = { ...p, message: capText(p.message, ECHO_LIMIT) };
  if (p.found !== undefined) out.found = capText(p.found, ECHO_LIMIT);
  if (p.field !== undefined) out.field = capText(p.field, ECHO_LIMIT);
  if (p.expected !== undefined) out.expected = capText(p.expected, HINT_LIMIT);
  if (p.fix !== undefined) out.fix = capText(p.fix, HINT_LIMIT);
  return out;
}

/**
 * Thrown inside readers and validators; caught at the wafer boundary and
 * turned into data. `problem` is the first; `problems` holds every problem
 * found in the file (a validator that checks everything throws them together:
 * see ProblemList).
 */
export class InputError extends Error {
  readonly problem: Problem;
  readonly problems: Problem[];
  /** Problems found beyond the cap and left out; when > 0 the last of `problems` is the line saying so. */
  readonly omitted: number;
  constructor(problem: Omit<Problem, "severity"> & { severity?: Severity }, more: Problem[] = [], omitted = 0) {
    const first = capProblem({ severity: "error", ...problem } as Problem);
    const rest = more.map(capProblem);
    super([first, ...rest].map(formatProblem).join("\n"));
    this.name = "InputError";
    this.problem = first;
    this.problems = [first, ...rest];
    this.omitted = omitted;
  }
}

/** Most problems reported for one file; beyond it one line says how many more there were. */
export const MAX_PROBLEMS_PER_FILE = 50;

/**
 * Collects a file's problems so that one bad field does not hide the next.
 * `attempt` runs a check and records the InputError it throws (every problem
 * it carries); `done` throws them all at once, at most MAX_PROBLEMS_PER_FILE
 * of them plus a line saying how many were left out.
 */
export class ProblemList {
  /** The first `cap` problems; the rest are only counted. */
  readonly problems: Problem[] = [];
  private dropped = 0;
  constructor(
    readonly file: string,
    readonly cap = MAX_PROBLEMS_PER_FILE,
  ) {}

  add(p: Omit<Problem, "severity"> & { severity?: Severity }): void {
    if (this.problems.length < this.cap) this.problems.push({ severity: "error", ...p });
    else this.dropped++;
  }

  /** Runs fn; an InputError it throws is recorded (with its count of left-out problems) and `undefined` returned. */
  attempt<T>(fn: () => T): T | undefined {
    try {
      return fn();
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      const own = err.omitted > 0 ? err.problems.slice(0, -1) : err.problems;
      for (const p of own) this.add(p);
      this.dropped += err.omitted;
      return undefined;
    }
  }

  get ok(): boolean {
    return this.problems.length === 0;
  }

  /** True once the cap is reached: a loop over many rows may stop looking. */
  get full(): boolean {
    return this.problems.length >= this.cap;
  }

  /** Throws every recorded problem together, with a closing line when some were left out; returns when there is none. */
  done(): void {
    if (this.ok) return;
    const [first, ...more] = this.problems;
    if (this.dropped > 0) {
      const n = this.dropped;
      more.push({
        severity: "error",
        file: this.file,
        message: `${n} more problem${n === 1 ? "" : "s"} in this file not listed (only the first ${this.cap} are shown)`,
        fix: "correct the problems above and build again to see the rest",
      });
    }
    throw new InputError(first, more, this.dropped);
  }
}

/** `path:line: message (expected …, found …) — fix` */
export function formatProblem(p: Problem): string {
  let where = p.file || "(data folder)";
  if (p.line !== undefined) where += `:${p.line}`;
  if (p.line !== undefined && p.column !== undefined) where += `:${p.column}`;
  let text = `${where}: `;
  if (p.severity === "warning") text += "warning: ";
  if (p.field) text += `${p.field}: `;
  text += p.message;
  const detail: string[] = [];
  if (p.expected !== undefined) detail.push(`expected ${p.expected}`);
  if (p.found !== undefined) detail.push(`found ${p.found}`);
  if (detail.length) text += ` (${detail.join(", ")})`;
  if (p.fix) text += ` — ${p.fix}`;
  return text;
}

/** Shows a found value briefly and safely in a message. */
export function show(value: unknown): string {
  if (value === undefined) return "nothing";
  if (value === null) return "null";
  if (typeof value === "string") {
    const s = value.length > 40 ? `${value.slice(0, 37)}…` : value;
    return JSON.stringify(s);
  }
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  if (Array.isArray(value)) return `a list of ${value.length}`;
  if (value instanceof Date) return `the date ${value.toISOString().slice(0, 10)}`;
  return "a mapping";
}

/** Levenshtein distance, for "did you mean" hints on near-miss keys. */
export function editDistance(a: string, b: string): number {
  const m = a.length;
  const n = b.length;
  let prev = Array.from({ length: n + 1 }, (_, j) => j);
  for (let i = 1; i <= m; i++) {
    const cur = [i];
    for (let j = 1; j <= n; j++) {
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[n];
}

/** The closest known name within a small edit distance, or undefined. */
export function didYouMean(name: string, known: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  for (const k of known) {
    const d = editDistance(name.toLowerCase(), k.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = k;
    }
  }
  return bestD <= Math.max(2, Math.floor(name.length / 3)) ? best : undefined;
}
