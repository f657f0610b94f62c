/**
 * The built demo site opened from disk (file://), as a user does who follows
 * the README's "open site/index.html": every link and asset relative and
 * present, the stylesheet applied, a chart drawn, navigation and search
 * working. Called from site.test.ts so it reuses that file's build and
 * browser (no second demo build).
 */
import { promises as fs, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { PNG } from "pngjs";
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import type { Site } from "./harness.ts";

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = path.join(dir, n);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
}

/** Canvas pixels clearly unlike its corner (background) pixel. */
async function ink(page: Page, selector: string): Promise<number> {
  const c = page.locator(selector).first();
  await c.scrollIntoViewIfNeeded();
  const img = PNG.sync.read(await c.screenshot());
  const d = img.data;
  let n = 0;
  for (let i = 0; i < d.length; i += 4) if (Math.max(Math.abs(d[i] - d[0]), Math.abs(d[i + 1] - d[1]), Math.abs(d[i + 2] - d[2])) > 40) n++;
  return n;
}

export function fromDiskChecks(getSite: () => Site): void {
  it("every href, src and form action of every page is relative and names an existing file", async () => {
    const site = getSite();
    const pages = walk(site.dir).filter((f) => f.endsWith(".html"));
    expect(pages.length).toBeGreaterThan(20);
    const bad: string[] = [];
    let checked = 0;
    for (const f of pages) {
      const html = await fs.readFile(f, "utf8");
      for (const m of html.matchAll(/\s(?:href|src|action)="([^"]*)"/g)) {
        const url = m[1].replaceAll("&amp;", "&");
        if (url.startsWith("#") || url.startsWith("data:")) continue;
        checked++;
        if (/^([a-z][a-z0-9+.-]*:|\/)/i.test(url)) {
          bad.push(`${path.relative(site.dir, f)}: ${url} is not relative`);
          continue;
        }
        const target = path.resolve(path.dirname(f), decodeURIComponent(url.split(/[?#]/)[0]));
        if (!statSync(target, { throwIfNoEntry: false })?.isFile()) bad.push(`${path.relative(site.dir, f)}: ${url} names no file`);
      }
    }
    expect(checked).toBeGreaterThan(500);
    expect(bad).toEqual([]);
  });

  it("opens index.html from disk with its styles, follows the navigation, draws a chart and searches", { timeout: 300_000 }, async () => {
    const site = getSite();
    const ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error") errors.push(`${page.url()}: ${m.text()}`);
    });
    page.on("pageerror", (e) => errors.push(`${page.url()}: ${e.message}`));
    const home = pathToFileURL(path.join(site.dir, "index.html")).href;
    await page.goto(home, { waitUntil: "load" });
    // site.css gives the header a flex layout and a coloured band; unstyled, it is a block on a transparent background.
    const header = await page.evaluate(() => {
      const s = getComputedStyle(document.querySelector("header.top")!);
      return { display: s.display, background: s.backgroundColor };
    });
    expect(header.display).toBe("flex");
    expect(header.background).not.toBe("rgba(0, 0, 0, 0)");
    // The wafer table's script runs from disk too, and keeps its sort in the address.
    await page.locator("#wafer-table thead th").first().locator("button.sort").click();
    expect(page.url()).toContain("sort=0");

    // The header's Runs link, then a run, then one of its wafers: each lands on a page file, not a folder listing.
    await Promise.all([page.waitForURL(/\/runs\/index\.html$/), page.click("header.top nav >> text=Runs")]);
    expect(await page.textContent("h1")).toMatch(/run/i);
    await Promise.all([page.waitForURL(/\/runs\/[^/]+\/index\.html$/), page.click("main table tbody a >> nth=0")]);
    await Promise.all([page.waitForURL(/\/wafers\/[^/]+\/index\.html$/), page.click("main table tbody th a >> nth=0")]);
    const waferId = /\/wafers\/([^/]+)\//.exec(page.url())![1];
    await page.waitForSelector("canvas");
    await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
    expect(await ink(page, "canvas")).toBeGreaterThan(200);
    // The breadcrumb leads back to the wafer list.
    await Promise.all([page.waitForURL(home), page.click("nav.crumbs >> text=Wafers")]);

    // Search from the header box: the index is a script, so it loads from disk (fetch would be refused there).
    await page.fill("#site-search", waferId);
    await Promise.all([page.waitForURL(/\/search\/index\.html\?q=/), page.press("#site-search", "Enter")]);
    await page.waitForSelector("#search-results li a");
    await Promise.all([page.waitForURL(new RegExp(`/wafers/${waferId}/index\\.html#summary$`)), page.click("#search-results li a >> nth=0")]);
    expect(await page.textContent("h1")).toContain(waferId);
    expect(errors).toEqual([]);
    await ctx.close();
  });
}
