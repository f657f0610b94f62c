/**
 * The output folder's lock, which keeps two builds apart, and the errors that
 * stop a build. How a finished site is published (and what a killed build left
 * is recovered) is src/cli/siteLayout.ts; the checks made before anything is
 * written are src/cli/outputGuard.ts.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";

/** A build stopped for a reason that is not a bug (reported without a stack trace). */
export class BuildStoppedError extends Error {
  /** Whether the previous site is still published as it was (false only when publishing failed half-way and could not be undone). */
  previousKept = true;
}
/** Another live build holds the output folder's lock. */
export class BuildLockedError extends BuildStoppedError {}

/**
 * Takes the output folder's lock, `<out>.lock`, holding "pid@host". The lock
 * file is written under a temporary name and hard-linked into place, so it
 * never exists half-written. A lock is stale only when it names a process on
 * this host that no longer exists; a stale lock is renamed away (one taker
 * wins) before the lock is taken again. Returns the release function.
 */
export async function acquireLock(outDir: string): Promise<() => Promise<void>> {
  const lock = `${outDir}.lock`;
  const me = `${process.pid}@${os.hostname()}`;
  await fs.mkdir(path.dirname(outDir), { recursive: true });
  const tmp = `${lock}.${process.pid}.${Math.random().toString(36).slice(2)}`;
  await fs.writeFile(tmp, `${me}\n`);
  try {
    for (let attempt = 0; ; attempt++) {
      try {
        await fs.link(tmp, lock);
        return () => fs.rm(lock, { force: true });
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== "EEXIST" || attempt > 5) throw err;
      }
      const holder = (await fs.readFile(lock, "utf8").catch(() => "")).trim();
      if (holderAlive(holder)) {
        const who = /^(\d+)(?:@(.*))?$/.exec(holder);
        const desc = who ? (who[2] === undefined || who[2] === os.hostname() ? `process ${who[1]}` : `process ${who[1]} on ${who[2]}`) : "an unknown process";
        throw new BuildLockedError(`another build (${desc}) is writing ${outDir}; wait for it to finish, or delete ${lock} if that process is gone`);
      }
      // Stale: move it aside under a unique name (only one of several takers succeeds), then try again.
      await fs.rename(lock, `${lock}.stale-${process.pid}`).catch(() => {});
      await fs.rm(`${lock}.stale-${process.pid}`, { force: true });
    }
  } finally {
    await fs.rm(tmp, { force: true });
  }
}

/** Whether a lock's holder ("pid@host", or a bare pid from older versions) may still be running. */
function holderAlive(holder: string): boolean {
  const m = /^(\d+)(?:@(.*))?$/.exec(holder);
  if (!m) return false;
  if (m[2] !== undefined && m[2] !== os.hostname()) return true; // another machine's process: cannot tell, so assume it runs
  try {
    process.kill(Number(m[1]), 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM"; // exists, but belongs to another user
  }
}
