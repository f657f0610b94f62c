/**
 * The output folder's life cycle, so that a failed or killed build never
 * leaves a half-written site: a lock that keeps two builds apart, recovery of
 * what a killed build left behind, and the two-rename swap of the finished
 * folder into place.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";

/** A build stopped for a reason that is not a bug (reported without a stack trace; the previous site stays as it was). */
export class BuildStoppedError extends Error {}
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

/**
 * Run while holding the lock: a build killed between the two renames of
 * swapInto left the previous site at `.<out>-building-<pid>-old` and no
 * outDir; put it back. Other leftovers of killed builds are removed.
 */
export async function recoverInterrupted(outDir: string): Promise<void> {
  const parent = path.dirname(outDir);
  const prefix = `.${path.basename(outDir)}-building-`;
  const left = (await fs.readdir(parent)).filter((n) => n.startsWith(prefix) && /^\d+(-old|-pages)?$/.test(n.slice(prefix.length)));
  const hasOut = await fs.stat(outDir).then(() => true, () => false);
  const old = left.find((n) => n.endsWith("-old"));
  if (!hasOut && old) await fs.rename(path.join(parent, old), outDir);
  for (const n of left) if (n !== old || hasOut) await fs.rm(path.join(parent, n), { recursive: true, force: true });
}

/** Replaces outDir by tmpDir with two renames; the old folder is removed only after the new one is in place. */
export async function swapInto(tmpDir: string, outDir: string): Promise<void> {
  const old = `${tmpDir}-old`;
  await fs.rm(old, { recursive: true, force: true });
  let hadOld = false;
  try {
    await fs.rename(outDir, old);
    hadOld = true;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "ENOENT") throw err;
  }
  try {
    await fs.rename(tmpDir, outDir);
  } catch (err) {
    if (hadOld) await fs.rename(old, outDir);
    throw err;
  }
  if (hadOld) await fs.rm(old, { recursive: true, force: true });
}
