/**
 * The built demo site in a real browser (Debian's Chromium via playwright-core):
 * a crawl of every page reachable from the index, accessibility (axe-core),
 * keyboard reach, verdict marks, the wafer table's sorting and filters, site
 * search, the site opened from disk (file://, fromDisk.ts), screenshots at
 * desktop and phone widths (the print report is in readable.test.ts).
 * One build, one server and one browser for the whole file.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import pLimit from "p-limit";
import { PNG } from "pngjs";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { fromDiskChecks } from "./fromDisk.ts";
import { axeViolations, DEMO_HOOK_TIMEOUT_MS, OUTPUT, startSite, type Site } from "./harness.ts";

interface PageReport {
  key: string;
  ids: Set<string>;
  canvases: { label: string; ink: number; alt: boolean }[];
  verdicts: { text: string; shapes: number }[];
}

let site: Site;
const pages = new Map<string, PageReport>();
const consoleErrors: string[] = [];
const failed: string[] = [];
const external: string[] = [];
const anchors: { from: string; target: string; id: string }[] = [];
const otherLinks = new Map<string, string>(); // url → page that links it
let waferUrl = "";
/** The text of waferUrl's notes, read when the crawl visits it (site search looks for one of its words). */
let waferNotes = "";
/**
 * axe-core's serious and critical violations, by page key: one page of each kind (the templates: index, run,
 * search with results, trends, a metric's trend, targets, changes, a wafer page with its folded groups open),
 * checked on the crawl's own page once the crawl has read it, instead of loading it again.
 */
const axeByPage = new Map<string, string[]>();
/** The wafer page whose verdict states are checked (issue 15): judged metrics, findings, an unmeasured image metric, recorded figures folded below. */
const LEGEND_WAFER = "/wafers/TQ-2501/";
let legend: LegendReport | undefined;
const AXE_PAGES = new Set(["/", "/trends/", "/trends/peak_mobility/", "/targets/", "/changes/", LEGEND_WAFER]);

interface LegendReport {
  judged: string[];
  other: string[];
  legend: { word: string; shape: string; meaning: string }[];
  legendVisible: boolean;
}

async function openAll(page: Page): Promise<void> {
  await page.evaluate(() => document.querySelectorAll("details").forEach((d) => (d.open = true)));
}

/** The verdict words of a wafer page's tables and its legend (folded groups opened first). */
async function legendReport(page: Page): Promise<LegendReport> {
  return page.evaluate(() => {
    const legend = [...document.querySelectorAll("#verdict-legend dt .verdict")].map((v) => ({
      word: (v.textContent ?? "").trim(),
      shape: v.querySelector("svg")!.innerHTML.replace(/\s+/g, " "),
      meaning: (v.closest("div")!.querySelector("dd")!.textContent ?? "").trim(),
    }));
    // No named helpers inside evaluate: the test transform may wrap them in a helper the page does not have.
    return {
      judged: [...document.querySelectorAll("#metrics > .table-wrap table .verdict")].map((v) => (v.textContent ?? "").trim()),
      other: [...document.querySelectorAll("#other-figures table .verdict")].map((v) => (v.textContent ?? "").trim()),
      legend,
      legendVisible: !!document.querySelector("#verdict-legend summary")?.textContent?.trim(),
    };
  });
}

/** Path and query of a URL: the crawl's page key (a folder and its index.html are one page: links name index.html so the site opens from disk). */
const keyOf = (u: URL) => u.pathname.replace(/\/index\.html$/, "/") + u.search;
const isPage = (u: URL) => u.pathname.endsWith("/") || u.pathname.endsWith(".html");

async function settle(page: Page): Promise<void> {
  await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
}

async function visit(page: Page, url: URL, queue: URL[]): Promise<void> {
  const key = keyOf(url);
  const res = await page.goto(url.href, { waitUntil: "load" });
  if (res?.status() !== 200) failed.push(`${key}: HTTP ${res?.status()}`);
  await settle(page);
  const info = await page.evaluate(() => ({
    ids: [...document.querySelectorAll("[id]")].map((e) => e.id),
    links: [...document.querySelectorAll<HTMLAnchorElement>("a[href]")].map((a) => a.href),
    forms: [...document.querySelectorAll<HTMLFormElement>("form[action]")].map((f) => f.action),
    verdicts: [...document.querySelectorAll(".verdict")].map((v) => ({
      text: (v.textContent ?? "").trim(),
      shapes: v.querySelectorAll("svg circle, svg path, svg rect, svg polygon, svg ellipse").length,
    })),
  }));
  // Ink is read from each canvas's own pixels (getImageData, composited over the white page as a
  // screenshot would show them): the same count as a screenshot of the element, without one per chart.
  const canvases: PageReport["canvases"] = await page.evaluate(() =>
    [...document.querySelectorAll("canvas")].map((el) => {
      const label = el.getAttribute("data-chart") ?? el.getAttribute("aria-label") ?? "canvas";
      // A text alternative: role="img" with a label, or a sibling table/summary inside the figure.
      const alt =
        (el.getAttribute("role") === "img" && (el.getAttribute("aria-label") ?? "").trim().length > 10) ||
        !!el.closest("figure")?.querySelector("table, .sr-only");
      let ink = 0;
      const g = el.width > 0 && el.height > 0 ? el.getContext("2d") : null;
      if (g) {
        const d = g.getImageData(0, 0, el.width, el.height).data;
        const over = (i: number, c: number) => (d[i + c] * d[i + 3]) / 255 + 255 * (1 - d[i + 3] / 255);
        const bg = [over(0, 0), over(0, 1), over(0, 2)];
        for (let i = 0; i < d.length; i += 4) {
          if (Math.max(Math.abs(over(i, 0) - bg[0]), Math.abs(over(i, 1) - bg[1]), Math.abs(over(i, 2) - bg[2])) > 40) ink++;
        }
      }
      return { label, ink, alt };
    }),
  );
  pages.set(key, { key, ids: new Set(info.ids), canvases, verdicts: info.verdicts });
  if (waferUrl && key === keyOf(new URL(waferUrl))) waferNotes = (await page.textContent("#notes .notes")) ?? "";
  for (const href of [...info.links, ...info.forms]) {
    const u = new URL(href);
    if (u.protocol === "mailto:" || u.protocol === "data:") continue;
    if (u.origin !== site.origin) {
      external.push(`${key} links outside the site: ${href}`);
      continue;
    }
    if (u.hash.length > 1) anchors.push({ from: key, target: keyOf(u), id: decodeURIComponent(u.hash.slice(1)) });
    u.hash = "";
    if (isPage(u)) queue.push(u);
    else if (!otherLinks.has(u.href)) otherLinks.set(u.href, key);
    if (!waferUrl && /\/wafers\/[^/]+\/(index\.html)?$/.test(u.pathname)) waferUrl = u.href;
  }
}

async function crawl(): Promise<void> {
  const ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
  // Every request is watched, not intercepted (interception turns Chromium's cache off, so each of the 60 pages
  // would fetch and compile Chart.js again); one leaving the site is recorded here and cannot reach any host
  // (LAUNCH_ARGS resolve every name but 127.0.0.1 to nothing).
  ctx.on("request", (r) => {
    const u = new URL(r.url());
    if (u.origin !== site.origin && u.protocol !== "data:") external.push(`request outside the site: ${u.href}`);
  });
  const page = await ctx.newPage();
  let current = "";
  // Requests still in flight when a page is left would be aborted by the next navigation and
  // reported as failures; the crawl waits for them (see quiet()).
  let inFlight = 0;
  page.on("request", () => inFlight++);
  page.on("requestfinished", () => inFlight--);
  page.on("requestfailed", () => inFlight--);
  const quiet = async () => {
    for (let i = 0; i < 100 && inFlight > 0; i++) await page.waitForTimeout(50);
  };
  page.on("console", (m) => {
    if (m.type() === "error") consoleErrors.push(`${current}: ${m.text()}`);
  });
  page.on("pageerror", (e) => consoleErrors.push(`${current}: ${e.message}`));
  page.on("requestfailed", (r) => {
    if (r.url().startsWith(site.origin)) failed.push(`${current}: ${r.url()} (${r.failure()?.errorText})`);
  });
  page.on("response", (r) => {
    if (r.status() >= 400) failed.push(`${current}: ${r.url()} HTTP ${r.status()}`);
  });
  const queue: URL[] = [new URL("/", site.origin)];
  while (queue.length) {
    const u = queue.shift()!;
    if (pages.has(keyOf(u))) continue;
    current = keyOf(u);
    const t0 = Date.now();
    await visit(page, u, queue);
    const t1 = Date.now();
    await quiet();
    if (process.env.WB_TIMING) console.log(`crawl ${current} visit ${t1 - t0} ms quiet ${Date.now() - t1} ms inFlight ${inFlight}`);
    // Checked in place, after everything above was read: the page as the crawl saw it, plus axe.
    const firstRun = /^\/runs\/[^/]+\/$/.test(current) && ![...axeByPage.keys()].some((k) => k.startsWith("/runs/"));
    const firstSearch = current.startsWith("/search/?q=") && ![...axeByPage.keys()].some((k) => k.startsWith("/search/"));
    if (current === LEGEND_WAFER) {
      await openAll(page);
      legend = await legendReport(page);
    }
    if (AXE_PAGES.has(current) || firstRun || firstSearch) {
      if (firstSearch) await page.waitForSelector("#search-results li a");
      const a0 = Date.now();
      axeByPage.set(current, await axeViolations(page));
      if (process.env.WB_TIMING) console.log(`axe ${current} ${Date.now() - a0} ms`);
      await quiet();
    }
    // The search page is reached through the header form; search for the first wafer so its result links are crawled too.
    if (current === "/search/" && waferUrl) queue.push(new URL(`/search/?q=${/\/wafers\/([^/]+)\//.exec(waferUrl)![1]}`, site.origin));
  }
  await ctx.close();
}

beforeAll(async () => {
  const t0 = Date.now();
  site = await startSite();
  if (process.env.WB_TIMING) console.log(`startSite ${Date.now() - t0} ms`);
  await crawl();
}, DEMO_HOOK_TIMEOUT_MS + 300_000);

afterAll(async () => {
  await site?.close();
});

describe("crawl of every page reachable from the index", () => {
  it("reaches the index, wafer, run and search pages", () => {
    const keys = [...pages.keys()];
    expect(keys).toContain("/");
    expect(keys.filter((k) => k.startsWith("/wafers/")).length).toBeGreaterThan(5);
    expect(keys.filter((k) => /^\/runs\/.+\//.test(k)).length).toBeGreaterThan(0);
    expect(keys).toContain("/search/");
  });

  it("logs no console errors (CSP violations included) and no failed requests", () => {
    expect(consoleErrors).toEqual([]);
    expect(failed).toEqual([]);
  });

  it("makes no request and has no link outside 127.0.0.1", () => {
    expect(external).toEqual([]);
  });

  it("draws every chart canvas (non-background pixels)", () => {
    const all = [...pages.values()].flatMap((p) => p.canvases.map((c) => ({ page: p.key, ...c })));
    expect(all.length).toBeGreaterThan(0);
    expect(all.filter((c) => c.ink < 200)).toEqual([]);
  });

  it("gives every chart a text alternative", () => {
    const all = [...pages.values()].flatMap((p) => p.canvases.map((c) => ({ page: p.key, ...c })));
    expect(all.filter((c) => !c.alt)).toEqual([]);
  });

  it("resolves every internal link to a file", async () => {
    const bad: string[] = [];
    // A few requests at a time (the server answers HEAD from the file's size alone).
    const limit = pLimit(6);
    await Promise.all(
      [...otherLinks].map(([url, from]) =>
        limit(async () => {
          const r = await fetch(url, { method: "HEAD" });
          if (r.status !== 200) bad.push(`${from} → ${url}: ${r.status}`);
        }),
      ),
    );
    expect(otherLinks.size).toBeGreaterThan(0);
    expect(bad.sort()).toEqual([]);
  });

  it("resolves every #anchor to an element with that id on the target page", () => {
    expect(anchors.length).toBeGreaterThan(0);
    const bad = anchors.filter((a) => !pages.get(a.target)?.ids.has(a.id)).map((a) => `${a.from} → ${a.target}#${a.id}`);
    expect(bad).toEqual([]);
  });

  it("shows every verdict with a word and an svg shape, never colour alone", () => {
    const all = [...pages.values()].flatMap((p) => p.verdicts.map((v) => ({ page: p.key, ...v })));
    expect(all.length).toBeGreaterThan(10);
    expect(all.filter((v) => !/^[a-z]{3,}/i.test(v.text) || v.shapes < 1)).toEqual([]);
  });
});

/** axe-core's findings on the page the crawl checked (it must have reached and checked it). */
function axeOf(key: string | undefined): string[] {
  expect(key, "the crawl reached a page of this kind").toBeDefined();
  expect(axeByPage.has(key!), `the crawl checked ${key} with axe`).toBe(true);
  return axeByPage.get(key!)!;
}

describe("accessibility (axe-core): no serious or critical violations", () => {
  it("on the index", () => expect(axeOf("/")).toEqual([]));
  // A wafer page: checked below with its folded groups and legend open (verdict states), which covers it closed too.
  it("on a run page", () => expect(axeOf([...axeByPage.keys()].find((k) => k.startsWith("/runs/")))).toEqual([]));
  it("on the search page with results", () => expect(axeOf([...axeByPage.keys()].find((k) => k.startsWith("/search/?q=")))).toEqual([]));
  it("on /trends/", () => expect(axeOf("/trends/")).toEqual([]));
  it("on a per-metric trend page, /targets/ and /changes/", () => {
    for (const u of ["/trends/peak_mobility/", "/targets/", "/changes/"]) expect(axeOf(u), u).toEqual([]);
  });
});

describe("verdict states (issue 15): a word, a shape of their own and a legend; judged rows first", () => {
  it("every state in the tables has a text label that the legend explains, each legend shape is distinct", () => {
    expect(legend, `the crawl reached ${LEGEND_WAFER}`).toBeDefined();
    const r = legend!;
    expect(r.legendVisible).toBe(true);
    const words = r.legend.map((l) => l.word);
    for (const w of ["recorded", "unmeasured", "noted", "unjudged", "pass", "fail"]) expect(words).toContain(w);
    expect(new Set(r.legend.map((l) => l.shape)).size).toBe(r.legend.length);
    expect(r.legend.filter((l) => l.meaning.length < 10)).toEqual([]);
    for (const w of [...r.judged, ...r.other]) expect(words).toContain(w);
    // Judged first; the folded group holds only what was not judged.
    expect(r.judged).not.toContain("recorded");
    expect(r.other.length).toBeGreaterThan(0);
    expect(r.other.filter((w) => w !== "recorded" && w !== "unmeasured")).toEqual([]);
    expect(r.judged).toContain("unmeasured");
  });
  it("axe reports no serious or critical violations with the other figures and the legend unfolded", () => {
    expect(axeOf(LEGEND_WAFER)).toEqual([]);
  });
});

/** Tabs from the top of the page; returns the visible controls that focus never reached. */
async function unreachedByTab(page: Page): Promise<string[]> {
  const total = await page.evaluate(() => {
    const sel = "a[href], button, input:not([type=hidden]), select, textarea, summary, [tabindex]:not([tabindex='-1'])";
    const els = [...document.querySelectorAll<HTMLElement>(sel)].filter(
      (e) => !(e as HTMLButtonElement).disabled && e.getClientRects().length > 0 && getComputedStyle(e).visibility !== "hidden",
    );
    els.forEach((e, i) => e.setAttribute("data-kb", String(i)));
    (document.activeElement as HTMLElement | null)?.blur();
    return els.length;
  });
  // Each element that takes the focus marks itself (a focusin listener), so the Tab presses need no round trip of their own to ask.
  await page.evaluate(() => {
    document.addEventListener("focusin", (e) => (e.target as Element | null)?.setAttribute?.("data-kb-reached", ""), true);
  });
  const reachedCount = () => page.evaluate(() => document.querySelectorAll("[data-kb][data-kb-reached]").length);
  for (let i = 0; i < total + 15; i++) {
    await page.keyboard.press("Tab");
    if (i % 10 === 9 && (await reachedCount()) >= total) break;
  }
  return page.evaluate(() => [...document.querySelectorAll("[data-kb]:not([data-kb-reached])")].map((e) => e.outerHTML.slice(0, 100)));
}

describe("keyboard", () => {
  it("Tab reaches every control on the index and on a wafer page", async () => {
    const ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    for (const url of [`${site.origin}/`, waferUrl]) {
      await page.goto(url, { waitUntil: "load" });
      expect(await unreachedByTab(page), url).toEqual([]);
    }
    await ctx.close();
  });
});

describe("wafer table", () => {
  let ctx: BrowserContext;
  let page: Page;
  beforeAll(async () => {
    ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
    page = await ctx.newPage();
  });
  afterAll(async () => ctx?.close());
  const visibleIds = () => page.$$eval("#wafer-table tbody tr:not([hidden]) th a", (as) => as.map((a) => a.textContent ?? ""));

  it("sorts by a column with a header button and sets aria-sort", async () => {
    await page.goto(`${site.origin}/`, { waitUntil: "load" });
    const before = await visibleIds();
    const button = page.locator("#wafer-table thead th").first().locator("button.sort");
    await button.click();
    expect(await page.locator("#wafer-table thead th").first().getAttribute("aria-sort")).toBe("ascending");
    await button.click();
    expect(await page.locator("#wafer-table thead th").first().getAttribute("aria-sort")).toBe("descending");
    expect(await visibleIds()).toEqual([...before].sort().reverse());
    expect(page.url()).toContain("sort=0");
    expect(page.url()).toContain("dir=desc");
  });

  it("filters by verdict, shows the live count and restores the filter from the URL", async () => {
    await page.goto(`${site.origin}/`, { waitUntil: "load" });
    const total = (await visibleIds()).length;
    const verdicts = await page.$$eval("#wafer-table tbody tr", (rs) => rs.map((r) => r.getAttribute("data-verdict")));
    const pick = verdicts.find((v) => v !== "pass") ?? "pass";
    const expected = verdicts.filter((v) => v === pick).length;
    await page.selectOption("#f-verdict", pick);
    expect((await visibleIds()).length).toBe(expected);
    expect(await page.textContent("#wafer-count")).toBe(`${expected} of ${total} wafers shown`);
    const linked = page.url();
    expect(linked).toContain(`verdict=${pick}`);
    await page.goto(linked, { waitUntil: "load" });
    expect(await page.inputValue("#f-verdict")).toBe(pick);
    expect((await visibleIds()).length).toBe(expected);
  });

  it("filters by growth date range and free text", async () => {
    await page.goto(`${site.origin}/`, { waitUntil: "load" });
    const grown = (await page.$$eval("#wafer-table tbody tr", (rs) => rs.map((r) => r.getAttribute("data-grown") ?? ""))).sort();
    const mid = grown[Math.floor(grown.length / 2)];
    await page.fill("#f-from", mid);
    expect((await visibleIds()).length).toBe(grown.filter((g) => g >= mid).length);
    await page.fill("#f-to", mid);
    expect((await visibleIds()).length).toBe(grown.filter((g) => g === mid).length);
    await page.click("#f-reset");
    const first = (await visibleIds())[0];
    await page.fill("#f-text", first);
    expect(await visibleIds()).toContain(first);
    // Exactly the rows whose text holds the term (case-blind) stay visible; the term must leave some rows out, or a filter that does nothing would pass.
    const holding = await page.$$eval(
      "#wafer-table tbody tr",
      (rs, t) => rs.filter((r) => (r.textContent ?? "").toLowerCase().includes(t)).map((r) => r.querySelector("th a")?.textContent ?? ""),
      first.toLowerCase(),
    );
    expect(holding.length).toBeGreaterThan(0);
    expect(holding.length).toBeLessThan(grown.length);
    expect(await visibleIds()).toEqual(holding);
    expect(page.url()).toContain(`text=${first}`);
  });

  it("is a plain, complete table without JavaScript", async () => {
    const noJs = await site.browser.newContext({ javaScriptEnabled: false });
    const p = await noJs.newPage();
    await p.goto(`${site.origin}/`);
    const rows = await p.$$eval("#wafer-table tbody tr", (rs) => rs.length);
    expect(rows).toBe([...pages.keys()].filter((k) => /^\/wafers\/[^/]+\/$/.test(k)).length);
    expect(await p.isVisible("#wafer-filters")).toBe(false);
    await noJs.close();
  });
});

describe("site search", () => {
  it("finds a wafer by id and by a word of its notes, linking to the section", async () => {
    const ctx = await site.browser.newContext();
    const page = await ctx.newPage();
    const id = /\/wafers\/([^/]+)\//.exec(waferUrl)![1];
    await page.goto(`${site.origin}/search/?q=${id}`, { waitUntil: "load" });
    await page.waitForSelector("#search-results li a");
    const first = await page.getAttribute("#search-results li a", "href");
    expect(first).toBe(`../wafers/${id}/index.html#summary`);
    // A long word from that wafer's notes (read by the crawl) leads to its #notes section.
    const word = (waferNotes.match(/[A-Za-z]{8,}/g) ?? []).sort((a, b) => b.length - a.length)[0] ?? "";
    expect(word, "the wafer's notes hold a word of 8+ letters to search for").not.toBe("");
    {
      await page.goto(`${site.origin}/search/?q=${encodeURIComponent(word)}`, { waitUntil: "load" });
      await page.waitForSelector("#search-results li a");
      const hrefs = await page.$$eval("#search-results li a", (as) => as.map((a) => a.getAttribute("href")));
      expect(hrefs).toContain(`../wafers/${id}/index.html#notes`);
    }
    // The header search box submits to the search page.
    await page.goto(`${site.origin}/`);
    await page.fill("#site-search", id);
    await Promise.all([page.waitForURL(/\/search\/(index\.html)?\?q=/), page.press("#site-search", "Enter")]);
    await page.waitForSelector("#search-results li a");
    await ctx.close();
  });
});

describe("opened from disk (file://)", () => fromDiskChecks(() => site));

describe("screenshots", () => {
  it("index and a wafer page at 1280 px and 390 px, without sideways scrolling", async () => {
    // One page per URL, narrowed after the wide shot (the layout and the charts follow the viewport, as on a turned phone).
    const ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    for (const [name, url] of [
      ["index", `${site.origin}/`],
      ["wafer", waferUrl],
    ] as const) {
      await page.setViewportSize({ width: 1280, height: 900 });
      await page.goto(url, { waitUntil: "load" });
      for (const width of [1280, 390]) {
        if (width !== 1280) await page.setViewportSize({ width, height: 844 });
        await settle(page);
        const file = path.join(OUTPUT, `${name}-${width}.png`);
        await page.screenshot({ path: file });
        expect(PNG.sync.read(await fs.readFile(file)).width).toBe(width);
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
        expect(overflow, `${name} at ${width} px scrolls sideways`).toBeLessThanOrEqual(1);
      }
    }
    await ctx.close();
  });
});
