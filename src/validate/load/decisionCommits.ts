/**
 * Which commit recorded each wafer's decision (wafer.md `decision:`), and who committed it.
 *
 * For a wafer with a decision, the commits that changed its wafer.md are walked newest first and
 * the file read at each (one `git cat-file --batch` process for all of them); the recording commit is the oldest of the
 * unbroken newest-first stretch whose `decision:` block equals today's (compared field by field
 * after parsing). When the newest commit does not hold today's decision, the decision is not
 * committed yet. The committer's and author's names come from that commit object's header. A
 * decider's name that matches neither is noted (a technician may commit for the QA lead; the
 * page says so rather than calling it an error). Side-effecting reader; never throws — a git
 * failure becomes a note.
 */
import { commitNames, fileAtCommit, findRepo, withObjectReader, defaultGitRunner, type GitRepo, type GitRunner } from "../../read/gitHistory.ts";
import { readFrontMatter } from "../../read/frontMatter.ts";
import type { DataHistory } from "./history.ts";
import type { Decision } from "../decision.ts";

export interface DecisionCommit {
  /** Set when the recording commit was found. */
  hash?: string;
  shortHash?: string;
  /** Committer date, ISO 8601. */
  committedAt?: string;
  committer?: string;
  author?: string;
  subject?: string;
  /** Plain words: not committed yet, the decider differs from the committer, or why git could not tell. */
  note?: string;
}

/** Most wafer.md versions read per wafer while looking for the recording commit. */
export const MAX_VERSIONS_READ = 50;

const norm = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]+/gu, " ")
    .trim();

/** True when the names plausibly name the same person (one contains the other, ignoring case and punctuation). */
export function sameName(a: string, b: string): boolean {
  const x = norm(a);
  const y = norm(b);
  return x !== "" && y !== "" && (x.includes(y) || y.includes(x));
}

function decisionIn(text: string | null, file: string): string | null {
  if (text === null) return null;
  try {
    const data = readFrontMatter(text, file).data as Record<string, unknown> | null;
    const d = data?.decision as Record<string, unknown> | undefined;
    if (!d || typeof d !== "object") return null;
    const date = d.date instanceof Date ? d.date.toISOString().slice(0, 10) : String(d.date ?? "");
    return JSON.stringify([String(d.state ?? ""), String(d.by ?? "").trim(), date, String(d.reason ?? "").trim()]);
  } catch {
    return null;
  }
}

/** Finds the recording commit of one wafer's decision. */
export async function decisionCommit(repo: GitRepo, history: DataHistory, file: string, decision: Decision): Promise<DecisionCommit> {
  const want = JSON.stringify([decision.state, decision.by, decision.date, decision.reason]);
  const commits = history.commits.filter((c) => c.dataFiles.includes(file)).slice(0, MAX_VERSIONS_READ);
  let found: (typeof commits)[number] | undefined;
  for (const c of commits) {
    if (decisionIn(await fileAtCommit(repo, c.hash, file), file) !== want) break;
    found = c;
  }
  if (!found) return { note: "this decision is not committed yet: no commit records it" };
  let committer = "";
  let author = found.author;
  try {
    const names = await commitNames(repo, found.hash);
    if (names) ({ committer, author } = names);
    else [committer, author] = (await repo.run(["show", "-s", "--no-color", "--format=%cn%x00%an", found.hash], repo.root)).replace(/\n$/, "").split("\0");
  } catch {
    committer = "";
  }
  const out: DecisionCommit = {
    hash: found.hash,
    shortHash: found.shortHash,
    committedAt: found.committedAt,
    committer: committer || undefined,
    author,
    subject: found.subject,
  };
  if (committer && !sameName(decision.by, committer) && !sameName(decision.by, author)) {
    out.note = `the decision names ${decision.by}, but the commit that recorded it was committed by ${committer}${author !== committer ? ` (author ${author})` : ""}`;
  }
  return out;
}

/** Recording commits of every wafer that has a decision, keyed by wafer id; empty without history. */
export async function decisionCommits(
  dataDir: string,
  history: DataHistory | null,
  wafers: readonly { id: string; file: string; decision?: Decision }[],
  run: GitRunner = defaultGitRunner,
): Promise<Map<string, DecisionCommit>> {
  const out = new Map<string, DecisionCommit>();
  const withDecision = wafers.filter((w) => w.decision);
  if (!history || withDecision.length === 0) return out;
  const repo = await findRepo(dataDir, run);
  if (!repo) return out;
  await withObjectReader(repo, async () => {
    for (const w of withDecision) {
      try {
        out.set(w.id, await decisionCommit(repo, history, w.file, w.decision!));
      } catch (err) {
        out.set(w.id, { note: `could not read the decision's history: ${(err as Error).message.split("\n")[0]}` });
      }
    }
  });
  return out;
}
