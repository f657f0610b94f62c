/**
 * Safe, read-only access to the data folder.
 *
 * Every raw file is opened once, read-only, and checked before parsing: it
 * must lie inside the data folder after symbolic links are resolved, must be
 * below a size limit, must not be binary and must be valid UTF-8. A leading
 * byte-order mark is removed. Nothing here ever writes to the data folder.
 *
 * One file, read once: the path is resolved (links followed) and checked to
 * lie inside the data folder, then that resolved path is opened with
 * O_NOFOLLOW (a link put in its place meanwhile is refused, not followed) and
 * O_NONBLOCK (a FIFO cannot stall the build), and the open descriptor itself
 * is checked: on Linux the path the kernel gives for it (/proc/self/fd/N) must
 * still lie inside the data folder, elsewhere its device and inode must be
 * those of the checked path. Size and type come from the descriptor (fstat),
 * and the bytes are read from it; the caller hashes and parses those bytes,
 * and the raw copy published is made from the same kind of checked descriptor
 * (src/cli/writeWaferFiles.ts). A file swapped for a link to a file outside
 * the data folder while a build runs is therefore either read as the file it
 * was, or refused; its outside bytes are never read.
 */
import { constants as fsConstants, promises as fs, type Dirent, type Stats } from "node:fs";
import type { FileHandle } from "node:fs/promises";
import path from "node:path";
import picomatch from "picomatch";
import { InputError } from "../model/problem.ts";

/** Largest raw text file accepted, in bytes (documented in docs/formats.md). */
export const MAX_TEXT_FILE_BYTES = 64 * 1024 * 1024;
/** Largest image file accepted, in bytes. */
export const MAX_IMAGE_FILE_BYTES = 128 * 1024 * 1024;

export interface DataFile {
  /** Path relative to the data folder, forward slashes. */
  rel: string;
  abs: string;
  bytes: Buffer;
}

export function relPath(dataDir: string, abs: string): string {
  return path.relative(dataDir, abs).split(path.sep).join("/");
}

/** Resolved data folders (dataDir → its real path), so a build resolves each root once, not once per file. */
const realRoots = new Map<string, string>();

/** The data folder with symbolic links resolved, memoised per dataDir; a failure is not remembered. */
async function realRoot(dataDir: string): Promise<string> {
  let real = realRoots.get(dataDir);
  if (real === undefined) {
    real = await fs.realpath(dataDir);
    realRoots.set(dataDir, real);
  }
  return real;
}

/**
 * Resolves symbolic links and refuses anything that ends up outside the data
 * folder; returns the resolved path. The folder itself is resolved once per
 * process (it is not expected to be re-linked during a build); each file is
 * resolved on every call.
 */
export async function checkInside(dataDir: string, abs: string): Promise<string> {
  const rel = relPath(dataDir, abs);
  const realRootDir = await realRoot(dataDir);
  let real: string;
  try {
    real = await fs.realpath(abs);
  } catch {
    throw new InputError({ file: rel, message: "file not found", fix: "check the file name and that it is committed" });
  }
  if (!isInside(realRootDir, real)) throw outsideError(rel, real);
  return real;
}

function isInside(root: string, real: string): boolean {
  const inside = path.relative(root, real);
  return !(inside.startsWith("..") || path.isAbsolute(inside));
}

function outsideError(rel: string, real: string): InputError {
  return new InputError({
    file: rel,
    message: "refused: this path leads outside the data folder",
    expected: "a file inside the data folder",
    found: "a symbolic link or path to " + JSON.stringify(real),
    fix: "copy the file into the wafer folder instead of linking to it",
  });
}

function changedError(rel: string): InputError {
  return new InputError({
    file: rel,
    message: "the file was replaced while it was being read (it is now a symbolic link or another file)",
    expected: "a file that stays in place during the build",
    found: "a different file at the checked path",
    fix: "build again once the file is in place, and copy files into the wafer folder instead of linking to them",
  });
}

/** An open data file: the descriptor that was checked, and its fstat. The caller closes `handle`. */
export interface OpenDataFile {
  rel: string;
  handle: FileHandle;
  stat: Stats;
}

/**
 * Opens a data file once, safely (see the file's doc comment): the resolved
 * path is checked to lie inside the data folder, opened without following a
 * link in its place, and the descriptor is checked to be that file.
 */
export async function openDataFile(dataDir: string, abs: string): Promise<OpenDataFile> {
  const rel = relPath(dataDir, abs);
  const real = await checkInside(dataDir, abs);
  let handle: FileHandle;
  try {
    handle = await fs.open(real, fsConstants.O_RDONLY | fsConstants.O_NOFOLLOW | fsConstants.O_NONBLOCK);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === "ELOOP" || code === "EMLINK") throw changedError(rel);
    if (code === "ENOENT") throw new InputError({ file: rel, message: "file not found", fix: "check the file name and that it is committed" });
    if (code === "ENXIO")
      throw new InputError({
        file: rel,
        message: "not a regular file",
        expected: "a file",
        found: "a socket or device",
        fix: "make the pattern or path that names it match files only",
      });
    throw new InputError({
      file: rel,
      message: "file cannot be opened",
      expected: "a readable file",
      found: code ?? String(err),
      fix: "check the file's permissions",
    });
  }
  try {
    const stat = await handle.stat();
    let fdPath: string | undefined;
    try {
      fdPath = await fs.readlink(`/proc/self/fd/${handle.fd}`);
    } catch {
      // no /proc (not Linux): compare the descriptor with the checked path instead
    }
    if (fdPath !== undefined) {
      if (!isInside(await realRoot(dataDir), fdPath.replace(/ \(deleted\)$/, ""))) throw outsideError(rel, fdPath);
    } else {
      const now = await fs.lstat(real).catch(() => undefined);
      if (!now || now.dev !== stat.dev || now.ino !== stat.ino) throw changedError(rel);
    }
    return { rel, handle, stat };
  } catch (err) {
    await handle.close();
    throw err;
  }
}

/** Reads an open file's bytes from its descriptor (at most `size`: what fstat reported). */
export async function readOpenFile(handle: FileHandle, size: number): Promise<Buffer> {
  const bytes = Buffer.allocUnsafe(size);
  let got = 0;
  while (got < size) {
    const { bytesRead } = await handle.read(bytes, got, size - got, got);
    if (bytesRead === 0) break;
    got += bytesRead;
  }
  return got === size ? bytes : bytes.subarray(0, got);
}

/** Reads a raw file as bytes after the safety checks (inside the data folder, opened once, size limit). */
export async function readDataBytes(dataDir: string, abs: string, maxBytes = MAX_TEXT_FILE_BYTES): Promise<DataFile> {
  const { rel, handle, stat } = await openDataFile(dataDir, abs);
  try {
    if (!stat.isFile()) {
      throw new InputError({
        file: rel,
        message: "not a regular file",
        expected: "a file",
        found: "a folder or device",
        fix: "make the pattern or path that names it match files only",
      });
    }
    if (stat.size > maxBytes) {
      throw new InputError({
        file: rel,
        message: "file is too large",
        expected: `at most ${maxBytes} bytes (${+(maxBytes / 1048576).toFixed(1)} MiB)`,
        found: `${stat.size} bytes`,
        fix: "split the measurement into several files or decimate it before committing",
      });
    }
    return { rel, abs, bytes: await readOpenFile(handle, stat.size) };
  } finally {
    await handle.close();
  }
}

const utf8 = new TextDecoder("utf-8", { fatal: true });

/** Decodes bytes as UTF-8 text; refuses binary content and invalid UTF-8 with the line where it happens. */
export function decodeText(file: DataFile): string {
  const { bytes, rel } = file;
  if (bytes.length === 0) {
    throw new InputError({
      file: rel,
      message: "file is empty",
      expected: "text content",
      found: "0 bytes",
      fix: "commit the measurement data or remove the file",
    });
  }
  const nul = bytes.indexOf(0);
  // UTF-16 text (Windows "Unicode" exports): a byte-order mark, or every other byte zero in the first line's ASCII.
  const bom16 = bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff));
  const head = bytes.subarray(0, Math.min(bytes.length, 64));
  const zeros = (parity: number) => head.filter((b, i) => i % 2 === parity && b === 0).length;
  if (nul >= 0 && (bom16 || (head.length >= 8 && Math.max(zeros(0), zeros(1)) >= 0.9 * Math.floor(head.length / 2)))) {
    throw new InputError({
      file: rel,
      line: 1,
      message: "file is UTF-16 text",
      expected: "UTF-8 text",
      found: bom16 ? `a UTF-16 byte-order mark (${bytes[0] === 0xff ? "FF FE" : "FE FF"})` : "every other byte zero (UTF-16 without a byte-order mark)",
      fix: "save or export the file as UTF-8 (in a spreadsheet: CSV UTF-8); waferbook reads UTF-8 only",
    });
  }
  if (nul >= 0) {
    throw new InputError({
      file: rel,
      line: lineOfOffset(bytes, nul),
      message: "file looks binary",
      expected: "UTF-8 text (CSV or TSV)",
      found: "a NUL byte",
      fix: "export the measurement as CSV or TSV text",
    });
  }
  let text: string;
  try {
    text = utf8.decode(bytes);
  } catch {
    const bad = firstInvalidUtf8(bytes);
    throw new InputError({
      file: rel,
      line: lineOfOffset(bytes, bad),
      message: "bytes are not valid UTF-8",
      expected: "UTF-8 text",
      found: `byte 0x${bytes[bad].toString(16).padStart(2, "0")} at offset ${bad}`,
      fix: "re-save the file as UTF-8 (for example from a Latin-1 export)",
    });
  }
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

function lineOfOffset(bytes: Buffer, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) if (bytes[i] === 10) line++;
  return line;
}

/**
 * Offset of the first byte that starts an ill-formed UTF-8 sequence (the
 * Unicode Standard, ch. 3, Table 3-7 "Well-Formed UTF-8 Byte Sequences"):
 * lead bytes C2–F4 only (no overlong C0/C1, nothing past U+10FFFF), and the
 * second byte narrowed after E0 (A0–BF, no overlong), ED (80–9F, no
 * surrogates), F0 (90–BF, no overlong) and F4 (80–8F); 0 if none is found.
 */
function firstInvalidUtf8(bytes: Buffer): number {
  for (let i = 0; i < bytes.length; ) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    const len = b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
    if (len === 0) return i;
    const [lo, hi] = b === 0xe0 ? [0xa0, 0xbf] : b === 0xed ? [0x80, 0x9f] : b === 0xf0 ? [0x90, 0xbf] : b === 0xf4 ? [0x80, 0x8f] : [0x80, 0xbf];
    if (i + 1 >= bytes.length || bytes[i + 1] < lo || bytes[i + 1] > hi) return i;
    for (let k = 2; k < len; k++) if (i + k >= bytes.length || bytes[i + k] >> 6 !== 2) return i;
    i += len;
  }
  return 0;
}

/**
 * Lists every file under a folder, recursively, as paths relative to it
 * (sorted). `label` names the folder in messages (relative to the data
 * folder). The walk is node's recursive readdir, the one directory walker
 * the code uses (also src/cli/codeDigest.ts, cache.ts, pageReuse.ts and
 * scripts/bundle.mjs). Its entries come from the folder listing (lstat-like),
 * so a symbolic link is listed as a name and never descended into: whether
 * it may be read is decided when it is opened (openDataFile: its resolved
 * path must lie inside the data folder), and a linked wafer folder is
 * decided before this walk (linkedFolder.ts, with the reason it is skipped).
 * A link is kept unless `keepLink` (given the link's path relative to `dir`)
 * says no (src/read/linkedFolder.ts linkInWaferFolder decides for a wafer's
 * files, and names each link it skips).
 * Everything that is not a folder is listed (links, FIFOs, sockets too), so
 * a pattern that names one gets the reader's located refusal, not silence.
 * A chain of folders whose path exceeds the system's limit (ENAMETOOLONG,
 * e.g. 4096 bytes on Linux) is an InputError located at the chain's first
 * folder, not an internal error.
 */
export async function listFiles(dir: string, label = "", keepLink?: (rel: string) => Promise<boolean>): Promise<string[]> {
  let entries: Dirent[];
  try {
    entries = await fs.readdir(dir, { recursive: true, withFileTypes: true });
  } catch (err) {
    const e = err as NodeJS.ErrnoException;
    if (e.code !== "ENAMETOOLONG" || e.path === undefined) throw err;
    const sub = relPath(dir, e.path);
    const top = [label, sub.split("/")[0]].filter(Boolean).join("/");
    const depth = sub.split("/").length;
    throw new InputError({
      file: top,
      message: "folder path is longer than the system allows",
      expected: "a path of at most a few thousand characters",
      found: `folders nested ${depth} deep, ${e.path.length} characters in all`,
      fix: "flatten the folders or shorten their names",
    });
  }
  const out: string[] = [];
  for (const e of entries) {
    if (e.isDirectory()) continue;
    const rel = relPath(dir, path.join(e.parentPath, e.name));
    if (!keepLink || !e.isSymbolicLink() || (await keepLink(rel))) out.push(rel);
  }
  return out.sort();
}

/**
 * Refuses a file path (not a pattern) named in a record that is absolute or
 * climbs out of the wafer folder with `..`; `where` locates the field.
 */
export function checkRelativePath(rel: string, where: { file: string; field: string; line?: number }): void {
  if (path.isAbsolute(rel) || /^[A-Za-z]:[\\/]/.test(rel) || rel.startsWith("\\")) {
    throw new InputError({
      ...where,
      message: "file path must be relative to the wafer folder",
      expected: 'a path such as "images/haadf-01.png"',
      found: JSON.stringify(rel),
      fix: "remove the leading slash or drive",
    });
  }
  if (rel.split(/[\\/]/).includes("..")) {
    throw new InputError({
      ...where,
      message: "refused: file path leads outside the wafer folder",
      expected: "a path inside the wafer folder",
      found: JSON.stringify(rel),
      fix: 'move the file into the wafer folder and drop the ".."',
    });
  }
}

/**
 * Expands a glob relative to a wafer folder. Refuses absolute paths and any
 * pattern that climbs out of the folder (`..`). Returns paths relative to the
 * wafer folder, sorted.
 */
export function matchGlob(pattern: string, files: readonly string[], where: { file: string; field: string }): string[] {
  if (path.isAbsolute(pattern) || /^[A-Za-z]:[\\/]/.test(pattern)) {
    throw new InputError({
      ...where,
      message: "file pattern must be relative to the wafer folder",
      expected: 'a pattern such as "transport/*.csv"',
      found: JSON.stringify(pattern),
      fix: "remove the leading slash or drive",
    });
  }
  if (pattern.split(/[\\/]/).includes("..")) {
    throw new InputError({
      ...where,
      message: "refused: file pattern leads outside the wafer folder",
      expected: "a pattern inside the wafer folder",
      found: JSON.stringify(pattern),
      fix: 'move the files into the wafer folder and drop the ".."',
    });
  }
  const isMatch = picomatch(pattern, { dot: false });
  return files.filter((f) => isMatch(f));
}
