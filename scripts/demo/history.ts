/**
 * The demo's own history: a small git repository, .demo-data/ (ignored by the
 * project's git), holding the demo data (data/) as the fictional Tarnwick lab
 * recorded it over months — targets first, each run's note when the run
 * started, each wafer's files by the person who measured it, a waiver added
 * after the device team's review, and a targets change that flips wafers
 * (the qubit mobility minimum raised from 0.9e5 to 1.0e5 cm²/(V s) in March
 * 2025: TQ-2502 goes from marginal to fail, TQ-2407 and TQ-2506 from pass to
 * marginal, as the changes page lists). `npm run build` builds this
 * repository, so the changes page and the wafers' histories tell the lab's
 * story rather than list waferbook's own development commits.
 *
 * Deterministic: every commit's author, committer and dates are scripted
 * (GIT_AUTHOR_DATE, GIT_COMMITTER_DATE …) and the user's git configuration is
 * not read, so the commit hashes are the same on every machine and every run,
 * and wafer pages are reused between builds. The last commit's tree is data/
 * exactly (checked). Without git, the folder is a plain copy of data/ (no history).
 *
 * Run: tsx scripts/demo/history.ts [data folder] [repository folder]
 */
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

interface Event {
  date: string;
  author: [string, string];
  message: string;
  /** Copies files from data/ (paths relative to it); `read` reads a file of data/ and `write` puts changed text into the repository. */
  apply: (io: {
    copy: (rel: string) => Promise<void>;
    write: (rel: string, text: string) => Promise<void>;
    read: (rel: string) => Promise<string>;
  }) => Promise<void>;
}

const STAFF = {
  qa: ["Ifeoma Okonkwo-Hale", "i.okonkwo-hale@tarnwick.example"],
  growth: ["Maarten Achterberg", "m.achterberg@tarnwick.example"],
  meas: ["Sofia Ferreira-Lund", "s.ferreira-lund@tarnwick.example"],
  student: ["Tobias Brannock", "t.brannock@tarnwick.example"],
} as const satisfies Record<string, [string, string]>;

/** Days after growth when a wafer's measurements were recorded. */
function plusDays(iso: string, days: number): string {
  const d = new Date(`${iso}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

const MOBILITY_NOW = 'peak_mobility: { min: "1.0e5 cm^2/(V s)"';
const MOBILITY_BEFORE = 'peak_mobility: { min: "0.9e5 cm^2/(V s)"';

async function frontMatterField(file: string, key: string): Promise<string> {
  const m = new RegExp(`^${key}: (.+)$`, "m").exec(await fs.readFile(file, "utf8"));
  if (!m) throw new Error(`${file} has no ${key}:`);
  return m[1].trim();
}

export async function events(dataDir: string): Promise<Event[]> {
  const list: Event[] = [];
  list.push({
    date: "2024-08-26T10:15:00+02:00",
    author: [...STAFF.qa],
    message: "Qualification targets for the SiGe qubit programme (qubit and test grades)",
    apply: async (io) => {
      const t = await io.read("targets.yaml");
      if (!t.includes(MOBILITY_NOW)) throw new Error(`targets.yaml no longer holds ${MOBILITY_NOW}: update scripts/demo/history.ts`);
      await io.write("targets.yaml", t.replace(MOBILITY_NOW, MOBILITY_BEFORE));
      await io.copy("analysis.yaml");
    },
  });
  for (const name of (await fs.readdir(path.join(dataDir, "runs"))).sort()) {
    const started = await frontMatterField(path.join(dataDir, "runs", name), "started");
    list.push({
      date: `${started}T08:40:00+01:00`,
      author: [...STAFF.growth],
      message: `Run ${name.replace(/\.md$/, "")}: growth notes and recipe`,
      apply: (io) => io.copy(`runs/${name}`),
    });
  }
  for (const id of (await fs.readdir(path.join(dataDir, "wafers"))).sort()) {
    const grown = await frontMatterField(path.join(dataDir, "wafers", id, "wafer.md"), "grown");
    const who = id === "TQ-2506" ? STAFF.student : STAFF.meas;
    const waived = id === "TQ-2408";
    list.push({
      date: `${plusDays(grown, 6)}T16:05:00+01:00`,
      author: [...who],
      message: `${id}: Hall bars at 1.6 K, X-ray maps, depth profile and micrographs`,
      apply: async (io) => {
        await io.copy(`wafers/${id}`);
        if (waived) {
          const text = await io.read(`wafers/${id}/wafer.md`);
          const without = text.replace(/^waivers:\n(?: {2}.*\n)+/m, "");
          if (without === text) throw new Error(`wafers/${id}/wafer.md has no waivers: block to hold back`);
          await io.write(`wafers/${id}/wafer.md`, without);
        }
      },
    });
    if (waived)
      list.push({
        date: "2024-12-03T11:30:00+01:00",
        author: [...STAFF.qa],
        message: `${id}: waive the turn-on voltage (device team confirms the gate stack up to 0.8 V)`,
        apply: (io) => io.copy(`wafers/${id}/wafer.md`),
      });
  }
  list.push({
    date: "2025-03-03T09:00:00+01:00",
    author: [...STAFF.qa],
    message: "Raise the qubit mobility minimum to 1.0e5 cm²/(V s) after the device review",
    apply: (io) => io.copy("targets.yaml"),
  });
  return list.sort((a, b) => Date.parse(a.date) - Date.parse(b.date));
}

function git(repo: string, args: string[], env: Record<string, string> = {}): string {
  return execFileSync("git", ["-c", "commit.gpgsign=false", "-c", "core.autocrlf=false", ...args], {
    cwd: repo,
    encoding: "utf8",
    env: { PATH: process.env.PATH ?? "/usr/bin:/bin", GIT_CONFIG_GLOBAL: "/dev/null", GIT_CONFIG_NOSYSTEM: "1", LC_ALL: "C", TZ: "UTC", ...env },
  });
}

/** Rewrites `repo` from scratch as the demo's history of `dataDir`; returns the number of commits. */
export async function writeDemoHistory(dataDir: string, repo: string): Promise<number> {
  await fs.rm(repo, { recursive: true, force: true });
  await fs.mkdir(repo, { recursive: true });
  git(repo, ["init", "-q", "-b", "main"]);
  const io = {
    copy: (rel: string) => fs.cp(path.join(dataDir, rel), path.join(repo, rel), { recursive: true }),
    write: async (rel: string, text: string) => fs.writeFile(path.join(repo, rel), text),
    read: (rel: string) => fs.readFile(path.join(dataDir, rel), "utf8"),
  };
  const list = await events(dataDir);
  for (const e of list) {
    await e.apply(io);
    git(repo, ["add", "-A"]);
    git(repo, ["commit", "-q", "-m", e.message], {
      GIT_AUTHOR_NAME: e.author[0],
      GIT_AUTHOR_EMAIL: e.author[1],
      GIT_AUTHOR_DATE: e.date,
      GIT_COMMITTER_NAME: e.author[0],
      GIT_COMMITTER_EMAIL: e.author[1],
      GIT_COMMITTER_DATE: e.date,
    });
  }
  // The last commit holds data/ exactly.
  const diff = execFileSync("diff", ["-rq", "--exclude=.git", dataDir, repo], { encoding: "utf8" });
  if (diff.trim()) throw new Error(`the demo history does not end at data/:\n${diff}`);
  return list.length;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const dataDir = path.resolve(process.argv[2] ?? path.join(root, "data"));
  const repo = path.resolve(process.argv[3] ?? path.join(root, ".demo-data"));
  try {
    execFileSync("git", ["--version"], { stdio: "ignore" });
  } catch {
    // The build reads the repository folder: without git it gets a plain copy of data/ (no history).
    await fs.rm(repo, { recursive: true, force: true });
    await fs.cp(dataDir, repo, { recursive: true });
    console.log("git is not installed: the demo is built without its history");
    process.exit(0);
  }
  const n = await writeDemoHistory(dataDir, repo);
  console.log(`demo history: ${n} commits of the Tarnwick lab in ${path.relative(process.cwd(), repo) || "."}/`);
}
