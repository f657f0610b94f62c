/**
 * Shared set-up for the browser tests: the demo site built once per test run
 * (test/helpers/demoSite.ts, shared with every other file that only reads it),
 * served on 127.0.0.1 (random port), and Debian's Chromium launched through
 * playwright-core. Fails fast, with a plain message, when Chromium is missing
 * (never downloads a browser).
 */
import { existsSync, promises as fs, readFileSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import type { AddressInfo } from "node:net";
import { chromium, type Browser, type Page } from "playwright-core";
import { demoSite } from "../helpers/demoSite.ts";

export { DEMO_HOOK_TIMEOUT_MS } from "../helpers/demoSite.ts";

export const ROOT = path.resolve(import.meta.dirname, "../..");
export const OUTPUT = path.join(ROOT, "test", "output");
export const CHROMIUM = process.env.WAFERBOOK_CHROMIUM ?? "/usr/bin/chromium";
/** Chromium flags for every browser test: no sandbox (containers), no GPU, no traffic of the browser's own, and no host but 127.0.0.1 (a request leaving the site fails instead of reaching the network). */
export const LAUNCH_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1",
];

/** Limit of one navigation or browser action (playwright's default is 30 s): generous, for a busy machine. */
export const BROWSER_STEP_TIMEOUT_MS = 120_000;

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".json": "application/json",
  ".png": "image/png",
  ".svg": "image/svg+xml",
  ".csv": "text/csv; charset=utf-8",
  ".txt": "text/plain; charset=utf-8",
  ".md": "text/markdown; charset=utf-8",
};

export interface Site {
  /** The shared demo site: read it, never change it (other test files read it at the same time). */
  dir: string;
  origin: string;
  browser: Browser;
  close: () => Promise<void>;
}

/** Where the test server serves axe-core (a path the site never uses). */
export const AXE_PATH = "/__test__/axe.min.js";
const AXE = readFileSync(path.join(ROOT, "node_modules", "axe-core", "axe.min.js"));

/**
 * Serious and critical axe-core violations of the page as it is now (served by serve(): axe comes from the
 * same origin, so no CSP bypass is needed and a page already open for other checks is checked in place).
 */
export async function axeViolations(page: Page): Promise<string[]> {
  await page.addScriptTag({ url: new URL(AXE_PATH, page.url()).href });
  return page.evaluate(async () => {
    const r = await (
      window as unknown as {
        axe: { run: (d: Document, o: object) => Promise<{ violations: { id: string; impact: string; help: string; nodes: { target: string[] }[] }[] }> };
      }
    ).axe.run(document, { resultTypes: ["violations"] });
    return r.violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map(
        (v) =>
          `${v.impact} ${v.id}: ${v.help} — ${v.nodes
            .slice(0, 3)
            .map((n) => n.target.join(" "))
            .join("; ")}`,
      );
  });
}

/** A static file server for `dir` on 127.0.0.1 with a random port. Folders serve their index.html. */
export async function serve(dir: string): Promise<{ origin: string; server: http.Server }> {
  const server = http.createServer(async (req, res) => {
    try {
      const url = new URL(req.url ?? "/", "http://127.0.0.1");
      if (url.pathname === AXE_PATH) {
        // axe-core from the site's own origin, so the page's Content-Security-Policy (script-src 'self') lets it run
        // without a CSP-bypassing context; cacheable, so Chromium compiles it once, not on every page.
        res.writeHead(200, { "content-type": TYPES[".js"], "cache-control": "max-age=3600", "content-length": AXE.length });
        res.end(AXE);
        return;
      }
      let file = path.join(dir, decodeURIComponent(url.pathname));
      if (!file.startsWith(dir)) throw new Error("outside");
      if ((await fs.stat(file)).isDirectory()) file = path.join(file, "index.html");
      const type = TYPES[path.extname(file)] ?? "application/octet-stream";
      if (req.method === "HEAD") {
        // The file's size is all a HEAD answer needs (stat throws for a missing file: 404 below).
        res.writeHead(200, { "content-type": type, "content-length": (await fs.stat(file)).size });
        res.end();
        return;
      }
      const body = await fs.readFile(file);
      // Cacheable for a minute: the same stylesheet and scripts on every page are fetched and compiled once.
      res.writeHead(200, { "content-type": type, "content-length": body.length, "cache-control": "max-age=60" });
      res.end(body);
    } catch {
      res.writeHead(404, { "content-type": "text/plain" });
      res.end("not found");
    }
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  return { origin: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, server };
}

/**
 * The demo site (built once per run, see demoSite.ts), served, and Chromium
 * launched. Call it from a beforeAll with DEMO_HOOK_TIMEOUT_MS: the first
 * file to ask may wait for the build.
 */
export async function startSite(): Promise<Site> {
  if (!existsSync(CHROMIUM)) {
    throw new Error(
      `Browser tests need Chromium at ${CHROMIUM}, which is missing. Install Debian's package (apt-get install chromium; .ci/run does this) or point WAFERBOOK_CHROMIUM at a Chromium binary.`,
    );
  }
  const dir = await demoSite();
  const { origin, server } = await serve(dir);
  let browser: Browser;
  try {
    browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: LAUNCH_ARGS, timeout: 30_000 });
  } catch (e) {
    server.close();
    throw new Error(`Chromium at ${CHROMIUM} did not start within 30 s: ${(e as Error).message.split("\n")[0]}`);
  }
  // Playwright's own limits (30 s a navigation or action) are missed when the machine is busy: every context
  // made from this browser (newPage makes one too) gets generous ones instead.
  const newContext = browser.newContext.bind(browser);
  browser.newContext = async (options) => {
    const ctx = await newContext(options);
    ctx.setDefaultTimeout(BROWSER_STEP_TIMEOUT_MS);
    ctx.setDefaultNavigationTimeout(BROWSER_STEP_TIMEOUT_MS);
    return ctx;
  };
  await fs.mkdir(OUTPUT, { recursive: true });
  return {
    dir,
    origin,
    browser,
    close: async () => {
      await browser.close();
      await new Promise((r) => server.close(r));
    },
  };
}
