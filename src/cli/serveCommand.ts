/**
 * `waferbook serve`: builds the site as `build` does, serves the output folder
 * on localhost with Eleventy's development server (@11ty/eleventy-dev-server,
 * which also injects the script that reloads an open page), watches the data
 * folder with Eleventy's watcher (@11ty/chokidar-with-glob-support, chokidar 4)
 * and rebuilds after a change. Changes are gathered for DEBOUNCE_MS after the
 * last one (saving a file, copying a folder of raw files), and a change during
 * a rebuild gives one more rebuild when it ends. A rebuild is an ordinary
 * build: atomic, so a failed one (a site-wide input error, say) prints its
 * located problems and leaves the last good site served; input errors inside a
 * wafer are printed and shown on its page, as with `build`.
 *
 * The data folder itself may go away (removed, renamed, a checkout of another
 * branch in the folder above): serve then says so, on stderr and as the open
 * pages' error notice, keeps serving the last site, and looks every
 * PRESENCE_MS; when the folder is back (or was replaced by a new folder of
 * the same name, which the old watcher would never report) it watches the
 * new folder and rebuilds, with no restart.
 *
 * The server listens on localhost only: it is a preview for the person editing
 * the records, not a way to publish (docs/publishing.md). Ctrl-C stops it.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import type { BuildOptions, ServeOptions } from "./args.ts";
import { EXIT } from "./args.ts";
import { runBuild } from "./buildCommand.ts";
import type { CommandIO } from "./main.ts";

/** Quiet time after the last change before rebuilding, in milliseconds. */
export const DEBOUNCE_MS = 300;
/** How often serve looks whether the data folder is still (or again) there, in milliseconds. */
export const PRESENCE_MS = 1000;
const HOST = "localhost";

export interface ServeHandle {
  /** The site's address, e.g. http://localhost:8080/. */
  url: string;
  /** Stops watching and serving. */
  close(): Promise<void>;
}

/** Builds, serves and starts watching; resolves once the server listens. */
/** Middleware: 400 for a request path that does not decode, or decodes to a segment "..", a backslash or a NUL. */
function refuseEscapingPaths(
  req: { url?: string },
  res: { statusCode: number; setHeader(k: string, v: string): void; end(b?: string): void },
  next: () => void,
): void {
  let decoded: string;
  try {
    decoded = decodeURIComponent(new URL(req.url ?? "/", "http://localhost").pathname);
  } catch {
    decoded = "\0";
  }
  if (decoded.split("/").some((seg) => seg === ".." || seg.includes("\\") || seg.includes("\0"))) {
    res.statusCode = 400;
    res.setHeader("content-type", "text/plain; charset=utf-8");
    res.end("bad request: the path leaves the site folder\n");
    return;
  }
  next();
}

export async function startServe(options: ServeOptions, io: CommandIO): Promise<ServeHandle> {
  const dataDir = path.resolve(options.data);
  const outDir = path.resolve(options.out);
  const buildOptions: BuildOptions = { data: options.data, out: options.out, strict: false, basePath: "", quiet: options.quiet };
  const buildOnce = () => runBuild(buildOptions, io, { announce: false });
  if ((await buildOnce()) !== EXIT.ok)
    io.err("waferbook serve: the first build failed; fix the problems above and save: the site is built again on every change.");

  const { default: DevServer } = await import("@11ty/eleventy-dev-server");
  const server = DevServer.getServer("waferbook", outDir, {
    domDiff: false,
    portReassignmentRetryCount: 0,
    messageOnStart: () => false,
    // A path that decodes to a parent folder (/..%2f..%2fetc) makes the package throw outside any handler, which ended
    // the process: such requests (any page in the user's browser can send one) get a 400 here first.
    middleware: [refuseEscapingPaths],
    logger: { info: () => {}, log: () => {}, error: (...a) => io.err(`waferbook serve: ${a.join(" ")}`) },
  });
  // The server only on localhost, and a port in use as a plain message (the package would retry without a host, or throw).
  const http = server.server;
  http.removeAllListeners("error");
  await new Promise<void>((resolve, reject) => {
    http.once("error", (e: NodeJS.ErrnoException) => reject(e.code === "EADDRINUSE" ? new PortInUseError(options.port) : e));
    http.listen({ port: options.port, host: HOST }, () => resolve());
  });
  await server.ready();
  http.on("error", (e: Error) => io.err(`waferbook serve: server error: ${e.message}`));
  const url = server.getServerUrl(HOST, "/");

  const { watch } = await import("@11ty/chokidar-with-glob-support");
  const watchData = () => {
    const w = watch(dataDir, { ignoreInitial: true, ignored: ["**/.git/**"], awaitWriteFinish: { stabilityThreshold: 150, pollInterval: 25 } });
    w.on("all", (_event: string, file: string) => {
      changed.add(path.relative(dataDir, file).split(path.sep).join("/") || ".");
      clearTimeout(timer);
      timer = setTimeout(() => void rebuild(), DEBOUNCE_MS);
    });
    // A watcher whose folder was just removed may report errors: the presence check speaks for that case.
    w.on(
      "error",
      (e: unknown) =>
        void checkPresence().then((there) => there && io.err(`waferbook serve: watching ${shown(dataDir)}: ${(e as Error)?.message ?? String(e)}`)),
    );
    return w;
  };
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> | undefined;
  let again = false;
  let changed = new Set<string>();
  /** The data folder's identity (device, inode) while it is there; null while it is gone. */
  let present = await folderIdentity(dataDir);
  const rebuild = async (): Promise<void> => {
    if (running) {
      again = true;
      return;
    }
    // A folder being removed sends a burst of deletions: no build against a missing folder (checkPresence says so once).
    if (!(await checkPresence())) return;
    const files = [...changed].sort();
    changed = new Set();
    io.err(`waferbook serve: ${files.slice(0, 3).join(", ")}${files.length > 3 ? ` and ${files.length - 3} more` : ""} changed: building…`);
    running = buildOnce().then((code) => {
      if (code === EXIT.ok) {
        server.reload({});
        io.err(`waferbook serve: built; open pages reload (${url})`);
      } else {
        server.sendError({ error: new Error("waferbook: the build failed; the terminal lists why. The last good site is still served.") });
        io.err("waferbook serve: the build failed (above); the last good site is still served.");
      }
    });
    await running;
    running = undefined;
    if (again) {
      again = false;
      await rebuild();
    }
  };
  let watcher = watchData();
  let checking: Promise<boolean> | undefined;
  /**
   * Whether the data folder is there. When it has gone, says so (stderr and the
   * open pages' error notice) and keeps serving the last site; when it is back —
   * or was replaced by another folder of the same name, which the watcher,
   * attached to the old folder, would never report — watches it afresh and rebuilds.
   */
  const checkPresence = (): Promise<boolean> =>
    (checking ??= (async () => {
      const now = await folderIdentity(dataDir);
      if (now === null) {
        if (present !== null) {
          present = null;
          const text = `the data folder ${shown(dataDir)} is gone (removed or renamed): the last site is still served; it is watched again and rebuilt as soon as the folder is back`;
          io.err(`waferbook serve: ${text}.`);
          server.sendError({ error: new Error(`waferbook: ${text}.`) });
        }
        return false;
      }
      if (now !== present) {
        const back = present === null;
        present = now;
        await watcher.close();
        watcher = watchData();
        await new Promise<void>((resolve) => watcher.once("ready", () => resolve()));
        io.err(`waferbook serve: the data folder ${shown(dataDir)} is ${back ? "back" : "a new folder (replaced)"}: watching it again.`);
        changed.add(".");
        clearTimeout(timer);
        timer = setTimeout(() => void rebuild(), DEBOUNCE_MS);
      }
      return true;
    })().finally(() => (checking = undefined)));
  // The watcher cannot report its own folder coming back: a look every PRESENCE_MS does.
  const presence = setInterval(() => void checkPresence(), PRESENCE_MS);
  presence.unref();
  await new Promise<void>((resolve) => watcher.once("ready", () => resolve()));
  io.out(`waferbook serve: ${url} (the site in ${shown(outDir)}, rebuilt when ${shown(dataDir)} changes; Ctrl-C stops)`);

  return {
    url,
    async close() {
      clearInterval(presence);
      clearTimeout(timer);
      await checking;
      await watcher.close();
      await running;
      await server.close();
    },
  };
}

/** "device:inode" of a folder, or null when there is none (removed, renamed, or a file in its place). */
async function folderIdentity(dir: string): Promise<string | null> {
  const st = await fs.stat(dir).catch(() => null);
  return st?.isDirectory() ? `${st.dev}:${st.ino}` : null;
}

/** A folder as the user would type it: relative below the working folder, else absolute. */
function shown(dir: string): string {
  const rel = path.relative(process.cwd(), dir);
  return rel === "" ? "." : rel.startsWith("..") || path.isAbsolute(rel) ? dir : rel;
}

class PortInUseError extends Error {
  constructor(port: number) {
    super(`port ${port} on ${HOST} is in use; choose another with --port N (0 picks a free one)`);
  }
}

/** The `serve` command: serves until interrupted (SIGINT, SIGTERM); returns the exit code. */
export async function runServe(options: ServeOptions, io: CommandIO): Promise<number> {
  let handle: ServeHandle;
  try {
    handle = await startServe(options, io);
  } catch (e) {
    if (e instanceof PortInUseError) {
      io.err(`waferbook serve: ${e.message}`);
      return EXIT.usage;
    }
    throw e;
  }
  await new Promise<void>((resolve) => {
    process.once("SIGINT", resolve);
    process.once("SIGTERM", resolve);
  });
  io.err("waferbook serve: stopping");
  await handle.close();
  return EXIT.ok;
}
