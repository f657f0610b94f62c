/**
 * Issue 13 §2 in the browser: hostile .html, .svg and .xhtml data files run
 * nothing on the site. The site built from test/reliability/outputHelpers.ts
 * hostileData is served by the harness's server; Chromium opens the wafer page
 * and every raw-file link on it. Each hostile file requests /__ran__ from the
 * site if its script ever runs; a control serves the same files under their
 * own names to show that the detector works. The page also makes no request
 * for the outside picture of its notes and logs no console error.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { chromium, type Browser, type Page } from "playwright-core";
import { useTempDir } from "../helpers/tempDir.ts";
import { build } from "../../src/cli/build.ts";
import { io } from "../reliability/corpus.ts";
import { HOSTILE, hostileData } from "../reliability/outputHelpers.ts";
import { CHROMIUM, LAUNCH_ARGS, serve } from "./harness.ts";

const tempDir = useTempDir("hostile-raw");
let browser: Browser;
let out = "";
beforeAll(async () => {
  const data = await hostileData(path.join(tempDir(), "data"));
  out = path.join(tempDir(), "site");
  expect((await build({ data, out, strict: false, basePath: "/", quiet: true, cache: null }, io)).ok).toBe(true);
  browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: LAUNCH_ARGS, timeout: 30_000 });
});
afterAll(async () => {
  await browser?.close();
});

/** Opens each URL in one page (downloads allowed) and returns the /__ran__ requests, console errors and requests leaving the origin. */
async function visit(origin: string, urls: string[]): Promise<{ ran: string[]; errors: string[]; outside: string[]; page: Page }> {
  const ctx = await browser.newContext({ acceptDownloads: true });
  const page = await ctx.newPage();
  const ran: string[] = [];
  const errors: string[] = [];
  const outside: string[] = [];
  ctx.on("request", (r) => {
    if (r.url().includes("/__ran__")) ran.push(r.url());
    else if (!r.url().startsWith(origin) && !r.url().startsWith("data:")) outside.push(r.url());
  });
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(m.text());
  });
  page.on("pageerror", (e) => errors.push(String(e)));
  for (const url of urls) {
    // A download ("Download is starting") is the expected end for an opaque copy.
    await page.goto(url, { waitUntil: "load", timeout: 15_000 }).catch(() => {});
    await page.waitForTimeout(400);
  }
  return { ran, errors, outside, page };
}

describe("hostile raw files on the site", () => {
  it("the control: the same files served under their own names do run (the detector works)", async () => {
    const control = path.join(tempDir(), "control");
    await fs.mkdir(control);
    await fs.writeFile(path.join(control, "evil.html"), HOSTILE.html);
    await fs.writeFile(path.join(control, "evil.svg"), HOSTILE.svg);
    const { origin, server } = await serve(control);
    try {
      const { ran } = await visit(origin, [`${origin}/evil.html`, `${origin}/evil.svg`]);
      expect(ran.length).toBeGreaterThanOrEqual(2);
    } finally {
      server.close();
    }
  }, 180_000);

  it("the wafer page and every raw-file link on it run nothing, request nothing outside the site and log no error", async () => {
    const { origin, server } = await serve(out);
    try {
      const first = await visit(origin, [`${origin}/wafers/EVIL-1/`]);
      const links = await first.page.$$eval('a[href*="/raw/"]', (as) => as.map((a) => (a as HTMLAnchorElement).href));
      await first.page.context().close();
      expect(links.filter((l) => l.endsWith(".bin")).length).toBeGreaterThanOrEqual(3);
      const rest = await visit(origin, links);
      await rest.page.context().close();
      expect([...first.ran, ...rest.ran]).toEqual([]);
      expect(first.outside).toEqual([]);
      expect(first.errors).toEqual([]);
    } finally {
      server.close();
    }
  }, 240_000);
});
