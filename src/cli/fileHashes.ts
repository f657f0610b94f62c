/**
 * A local record of file hashes, so a warm build need not read every raw file
 * again to compute the cache keys. The same idea as git's index: for each
 * file hashed, its SHA-256 is stored with the file's size, modification and
 * status-change times, inode and device; when all of these are unchanged the
 * stored hash is used instead of reading the file.
 *
 * Guards:
 *   - a hash is trusted only if the file's modification and status-change
 *     times were at least RACY_MS before the moment it was hashed ("racily
 *     clean" files, changed within the time-stamp granularity right after
 *     hashing, are read again);
 *   - the status-change time (ctime) cannot be set by tools that preserve
 *     modification times (cp -p, rsync -t, tar), so a rewrite is noticed even
 *     when size and mtime are restored;
 *   - the record is per machine (absolute paths, inodes) and lives in the
 *     cache folder; it is never shared or published. A fresh clone (new
 *     inodes and times) simply hashes everything once.
 * `--no-cache` does not use it. Deleting it is always safe.
 */
import { createHash } from "node:crypto";
import type { Stats } from "node:fs";
import { promises as fs } from "node:fs";
import path from "node:path";

const FORMAT = "waferbook-file-hashes-1";
/**
 * Bytes read at a time when hashing a file. A file is hashed through one
 * buffer of this size, never read whole, so memory per file being hashed is
 * bounded whatever its size (a stray multi-GB file in a wafer folder costs
 * time, not memory); cache.ts hashes at most 8 files of a folder and 4
 * folders at a time, 32 MiB in all.
 */
export const HASH_CHUNK_BYTES = 1 << 20;

/** SHA-256 (hex) of a file's bytes, read in chunks of HASH_CHUNK_BYTES (common practice: incremental hashing, FIPS 180-4 via node:crypto). */
export async function sha256File(abs: string): Promise<string> {
  const handle = await fs.open(abs, "r");
  try {
    // Small files (most raw files, every source file) get a buffer of their own size, not a whole chunk.
    const { size } = await handle.stat();
    const buf = Buffer.allocUnsafe(Math.min(HASH_CHUNK_BYTES, size + 1));
    const hash = createHash("sha256");
    for (;;) {
      const { bytesRead } = await handle.read(buf, 0, buf.length, null);
      if (bytesRead === 0) return hash.digest("hex");
      hash.update(buf.subarray(0, bytesRead));
    }
  } finally {
    await handle.close();
  }
}
/** Files modified less than this long before they were hashed are hashed again next time. */
const RACY_MS = 2000;

type Row = [size: number, mtimeMs: number, ctimeMs: number, ino: number, dev: number, hashedAt: number, sha256: string];

export class FileHashes {
  private rows = new Map<string, Row>();
  private changed = false;
  /** Files whose stored hash was used / that were read and hashed (for the benchmark and tests). */
  reused = 0;
  hashed = 0;

  private constructor(private readonly file: string | null) {}

  /** The record stored in cacheDir (empty if missing or unreadable), or a record that stores nothing when cacheDir is null. */
  static async open(cacheDir: string | null): Promise<FileHashes> {
    const h = new FileHashes(cacheDir ? path.join(cacheDir, "file-hashes.json") : null);
    if (h.file) {
      try {
        const data = JSON.parse(await fs.readFile(h.file, "utf8")) as { format?: string; rows?: Record<string, Row> };
        if (data.format === FORMAT && data.rows) h.rows = new Map(Object.entries(data.rows));
      } catch {
        // missing or damaged: start afresh
      }
    }
    return h;
  }

  /**
   * The recorded SHA-256 of a file whose size, times, inode and device are
   * what they were when it was hashed (and not racily modified), else undefined.
   */
  trusted(abs: string, st: Stats): string | undefined {
    const row = this.file ? this.rows.get(abs) : undefined;
    return row &&
      row[0] === st.size &&
      row[1] === st.mtimeMs &&
      row[2] === st.ctimeMs &&
      row[3] === st.ino &&
      row[4] === st.dev &&
      Math.max(st.mtimeMs, st.ctimeMs) < row[5] - RACY_MS
      ? row[6]
      : undefined;
  }

  /** SHA-256 (hex) of a regular file, from the record when the file is unchanged, else read and hashed. */
  async sha256(abs: string, st: Stats): Promise<string> {
    const known = this.trusted(abs, st);
    if (known) {
      this.reused++;
      return known;
    }
    const hashedAt = Date.now();
    const digest = await sha256File(abs);
    this.hashed++;
    if (this.file) {
      this.rows.set(abs, [st.size, st.mtimeMs, st.ctimeMs, st.ino, st.dev, hashedAt, digest]);
      this.changed = true;
    }
    return digest;
  }

  /** Writes the record (temporary file + rename) if anything was added; failures are ignored (it is an optimisation). */
  async save(): Promise<void> {
    if (!this.file || !this.changed) return;
    const tmp = `${this.file}.${process.pid}.tmp`;
    try {
      await fs.mkdir(path.dirname(this.file), { recursive: true });
      await fs.writeFile(tmp, JSON.stringify({ format: FORMAT, rows: Object.fromEntries(this.rows) }));
      await fs.rename(tmp, this.file);
      this.changed = false;
    } catch {
      await fs.rm(tmp, { force: true }).catch(() => {});
    }
  }
}
