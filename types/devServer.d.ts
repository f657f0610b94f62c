// The parts of Eleventy's development server and watcher that `waferbook serve` uses (they ship no types).
declare module "@11ty/eleventy-dev-server" {
  import type { Server } from "node:http";
  interface DevServerOptions {
    port?: number;
    liveReload?: boolean;
    domDiff?: boolean;
    portReassignmentRetryCount?: number;
    showVersion?: boolean;
    messageOnStart?: (info: { localhostUrl: string }) => string | false;
    logger?: { info: (...a: unknown[]) => void; log: (...a: unknown[]) => void; error: (...a: unknown[]) => void };
    /** Run before the package's own handler, in order: (req, res, next). */
    middleware?: ((req: import("node:http").IncomingMessage, res: import("node:http").ServerResponse, next: () => void) => void)[];
  }
  export default class EleventyDevServer {
    static getServer(name: string, dir: string, options?: DevServerOptions): EleventyDevServer;
    readonly server: Server;
    ready(): Promise<void>;
    getServerUrl(host: string, pathname?: string): string;
    reload(event?: { files?: string[]; subtype?: string }): void;
    sendError(e: { error: Error }): void;
    close(): Promise<void>;
  }
}

declare module "@11ty/chokidar-with-glob-support" {
  import type { EventEmitter } from "node:events";
  interface WatchOptions {
    ignored?: string | string[];
    ignoreInitial?: boolean;
    followSymlinks?: boolean;
    awaitWriteFinish?: { stabilityThreshold: number; pollInterval: number };
  }
  interface FSWatcher extends EventEmitter {
    close(): Promise<void>;
  }
  export function watch(paths: string | string[], options?: WatchOptions): FSWatcher;
}
