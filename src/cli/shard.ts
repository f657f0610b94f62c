/**
 * Shards: `waferbook build --shard K/N` analyses only the wafers of partition
 * K of N, so N CI jobs can share an archive's analysis (docs/scaling.md).
 *
 * The partition is a function of the wafer set alone (folder names and the
 * bytes of their files), so every shard, on any machine, computes the same
 * one without talking to the others, and together the N shards cover every
 * wafer exactly once. It is balanced by bytes, since analysis time follows the
 * raw data: the greedy "longest processing time first" rule (Graham 1969,
 * "Bounds on multiprocessing timing anomalies", SIAM J. Appl. Math. 17, 416):
 * wafers sorted by bytes, largest first, each given to the shard with the
 * fewest bytes so far (the lowest-numbered on a tie). Wafers of equal size
 * are taken in the order of the SHA-256 of their id, which spreads an
 * archive of equal-sized wafers over the shards independently of how the
 * ids are named or listed.
 */
import { createHash } from "node:crypto";
import { lstatSync } from "node:fs";
import path from "node:path";
import { listFiles } from "../read/dataFiles.ts";

export interface Shard {
  /** 1-based: 1 ≤ index ≤ count. */
  index: number;
  count: number;
}

/** The most shards a build may be split into (far beyond any CI's parallel jobs; keeps typos like 1/30000 out). */
export const MAX_SHARDS = 1024;

/** `"2/3"` → { index: 2, count: 3 }; otherwise `{ error }`, the usage message naming what was expected and what was found. */
export function parseShard(text: string): Shard | { error: string } {
  const m = /^\s*(\d{1,6})\s*\/\s*(\d{1,6})\s*$/.exec(text);
  const expected = `--shard K/N with whole numbers 1 ≤ K ≤ N ≤ ${MAX_SHARDS}, such as --shard 2/3 (the second of three shards)`;
  if (!m) return { error: `${expected}; found ${JSON.stringify(text)}` };
  const index = Number(m[1]);
  const count = Number(m[2]);
  if (count < 1 || count > MAX_SHARDS) return { error: `${expected}; found ${count} shards in ${JSON.stringify(text)}` };
  if (index < 1 || index > count) return { error: `${expected}; found shard ${index} of ${count} in ${JSON.stringify(text)}` };
  return { index, count };
}

/** SHA-256 (hex) of a wafer id: the order of wafers of equal size. */
const idHash = (id: string) => createHash("sha256").update(id).digest("hex");

/**
 * The shard (1-based) of every wafer: bytes largest first, each to the
 * lightest shard so far (lowest number on a tie), equal sizes in the order
 * of the hash of the id (then the id itself). Depends only on the set of
 * (id, bytes) pairs, never on the order they are given in.
 */
export function partition(wafers: readonly { id: string; bytes: number }[], count: number): Map<string, number> {
  const order = wafers
    .map((w) => ({ ...w, h: idHash(w.id) }))
    .sort((a, b) => b.bytes - a.bytes || (a.h < b.h ? -1 : a.h > b.h ? 1 : 0) || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  const load = new Array<number>(count).fill(0);
  const out = new Map<string, number>();
  for (const w of order) {
    let best = 0;
    for (let s = 1; s < count; s++) if (load[s] < load[best]) best = s;
    load[best] += w.bytes;
    out.set(w.id, best + 1);
  }
  return out;
}

/** Bytes of every regular file (or link's target) in a wafer folder; 0 for one that cannot be read (its build reports it). */
export async function waferBytes(dataDir: string, folder: string): Promise<number> {
  const dir = path.join(dataDir, "wafers", folder);
  let total = 0;
  for (const rel of await listFiles(dir).catch(() => [] as string[])) {
    try {
      total += lstatSync(path.join(dir, rel)).size;
    } catch {
      // vanished or unreadable: counted as empty
    }
  }
  return total;
}

/** The folders of `shard`, in the order given. */
export async function shardFolders(dataDir: string, folders: readonly string[], shard: Shard): Promise<string[]> {
  const sizes = await Promise.all(folders.map(async (id) => ({ id, bytes: await waferBytes(dataDir, id) })));
  const of = partition(sizes, shard.count);
  return folders.filter((f) => of.get(f) === shard.index);
}
