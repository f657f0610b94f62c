/**
 * The comparison and relation pages in a real browser (Debian's Chromium):
 * opened from an address as an emailed link would open them, over HTTP and
 * from disk (file://); the chosen wafers shown; charts drawn; axe-core with no
 * serious or critical violation; no console error; the wafer table's
 * checkboxes reachable by keyboard. One demo build (startSite) for the file.
 */
import path from "node:path";
import { pathToFileURL } from "node:url";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { axeViolations, OUTPUT, startSite, type Site } from "./harness.ts";

let site: Site;
let ctx: BrowserContext;
const errors: string[] = [];

beforeAll(async () => {
  site = await startSite();
  ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
}, 400_000);
afterAll(async () => {
  await ctx?.close();
  await site?.close();
});

async function open(url: string): Promise<Page> {
  const page = await ctx.newPage();
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(`${page.url()}: ${m.text()}`);
  });
  page.on("pageerror", (e) => errors.push(`${page.url()}: ${e.message}`));
  await page.goto(url, { waitUntil: "load" });
  await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
  return page;
}

/** Pixels of each canvas unlike its corner pixel (drawn ink), read from the canvas itself. */
async function inks(page: Page): Promise<number[]> {
  return page.evaluate(() =>
    [...document.querySelectorAll("canvas")].map((c) => {
      const d = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < d.length; i += 4) if (d[i + 3] > 100 && Math.abs(d[i] - 255) + Math.abs(d[i + 1] - 255) + Math.abs(d[i + 2] - 255) > 120) n++;
      return n;
    }),
  );
}

describe("comparison page", () => {
  it("shows the wafers named in the address side by side, with differences and three charts", { timeout: 120_000 }, async () => {
    const page = await open(`${site.origin}/compare/?w=TQ-2401,TQ-2403,TQ-2505`);
    await page.waitForSelector("#stacks table");
    expect(await page.textContent("#compare-status")).toContain("Comparing TQ-2401, TQ-2403, TQ-2505");
    const heads = await page.locator("#overview thead th").allTextContents();
    expect(heads.slice(1)).toEqual(["TQ-2401", "TQ-2403", "TQ-2505"]);
    // Peak mobility: each wafer's value with its unit and verdict word; Δ beside the others.
    const mobility = await page.locator("#metrics tbody tr", { hasText: "Peak Hall mobility" }).first().locator("td").allTextContents();
    expect(mobility).toHaveLength(3);
    for (const cell of mobility) expect(cell).toMatch(/cm²\/\(V s\).*(pass|fail|marginal|waived)/);
    expect(mobility[0]).not.toContain("Δ");
    expect(mobility[1]).toMatch(/Δ −.*%/); // TQ-2403's mobility is below TQ-2401's
    expect(await page.locator("#growth tbody tr", { hasText: "well: growth temperature" }).count()).toBe(1);
    const drawn = await inks(page);
    expect(drawn).toHaveLength(3); // mobility–density, gate calibrations, depth profiles
    for (const n of drawn) expect(n).toBeGreaterThan(300);
    expect(page.url()).toMatch(/\?w=TQ-2401,TQ-2403,TQ-2505$/);
    // The screenshot for docs/screenshots: the last metric rows, then the charts the wafers share.
    await page.evaluate(() => {
      document.getElementById("hall")!.scrollIntoView();
      window.scrollBy(0, -160);
    });
    await page.screenshot({ path: path.join(OUTPUT, "compare-1280.png") });
    // axe on this same page, drawn (served from the site's origin, so the page's CSP allows it).
    expect(await axeViolations(page)).toEqual([]);
    await page.close();
  });

  it("is reached from the wafer table by keyboard: tick two wafers, then Compare selected", { timeout: 60_000 }, async () => {
    const page = await open(`${site.origin}/`);
    const button = page.locator("#compare-selected");
    expect(await button.isDisabled()).toBe(true);
    for (const id of ["TQ-2405", "TQ-2502"]) {
      await page.locator(`input.pick[value="${id}"]`).focus();
      await page.keyboard.press("Space");
    }
    // Sorting the table keeps the choice.
    await page.locator("#wafer-table thead th button.sort").first().click();
    expect(await page.locator("input.pick:checked").count()).toBe(2);
    await button.focus();
    await Promise.all([page.waitForURL(/\/compare\/(index\.html)?\?w=TQ-2405,TQ-2502$/), page.keyboard.press("Enter")]);
    await page.waitForSelector("#metrics table");
    await page.close();
  });

  it("takes the wafers of a run from ?run=, as the run page links it", { timeout: 60_000 }, async () => {
    const page = await open(`${site.origin}/compare/?run=TQ25-B`);
    await page.waitForSelector("#metrics table");
    expect(await page.locator("#overview thead th").allTextContents()).toEqual(["Wafer", "TQ-2504", "TQ-2505", "TQ-2506", "TQ-2507"]);
    await page.close();
  });
});

describe("relation page", () => {
  it("draws the axes and filters named in the address, with series names, wafer labels and r and n", { timeout: 120_000 }, async () => {
    const page = await open(`${site.origin}/relation/?x=growth_well_temperature&y=interface_width_top&by=reactor&grade=qubit`);
    await page.waitForFunction(() => /plotted/.test(document.getElementById("relation-status")?.textContent ?? ""));
    expect(await page.inputValue("#r-x")).toBe("growth_well_temperature");
    expect(await page.inputValue("#r-by")).toBe("reactor");
    const rows = await page.locator("#relation-table tbody tr").allTextContents();
    expect(rows.length).toBeGreaterThanOrEqual(5);
    expect(rows.every((r) => /reactor (Heron|Kite)/.test(r))).toBe(true);
    expect(rows.some((r) => r.includes("TQ-2406"))).toBe(false); // test grade, filtered out
    expect(await page.textContent("#relation-fit")).toMatch(/r = -?\d\.\d{3}, n = \d+/);
    const legend = await page.evaluate(() => {
      const chart = (
        window as unknown as { Chart: { getChart: (c: Element) => { data: { datasets: { label: string; pointText?: string[] }[] } } } }
      ).Chart.getChart(document.getElementById("relation-canvas")!);
      return chart.data.datasets.map((d) => ({ label: d.label, labels: d.pointText ?? [] }));
    });
    expect(legend.map((d) => d.label.replace(/ \(.*/, ""))).toEqual(["reactor Heron", "reactor Kite", "least squares"]);
    expect(legend[0].labels).toContain("TQ-2401");
    expect((await inks(page))[0]).toBeGreaterThan(300);
    await page.screenshot({ path: path.join(OUTPUT, "relation-1280.png") });
    expect(await axeViolations(page)).toEqual([]);
    // A changed filter goes into the address.
    await page.selectOption("#r-run", "TQ24-B");
    expect(page.url()).toContain("run=TQ24-B");
    await page.close();
  });
});

describe("from disk (file://)", () => {
  it("the comparison and relation pages load their data without a server", { timeout: 60_000 }, async () => {
    const compare = pathToFileURL(path.join(site.dir, "compare", "index.html")).href;
    let page = await open(`${compare}?w=TQ-2402,TQ-2406`);
    await page.waitForSelector("#stacks table");
    expect(await page.textContent("#compare-status")).toContain("Comparing TQ-2402, TQ-2406");
    expect((await inks(page)).every((n) => n > 300)).toBe(true);
    await page.close();
    const relation = pathToFileURL(path.join(site.dir, "relation", "index.html")).href;
    page = await open(`${relation}?y=peak_mobility&x=density_at_peak_mobility`);
    expect(await page.textContent("#relation-status")).toMatch(/1[0-5] of 15 wafers plotted/);
    await page.close();
    const run = pathToFileURL(path.join(site.dir, "runs", "TQ24-A", "index.html")).href;
    page = await open(run);
    expect((await inks(page))[0]).toBeGreaterThan(300);
    // The run page's entry point opens the comparison of its wafers.
    await Promise.all([page.waitForURL(/\/compare\/index\.html\?w=TQ-2401,TQ-2402,TQ-2403,TQ-2404$/), page.click("text=Compare the wafers of this run")]);
    await page.waitForSelector("#metrics table");
    // A wafer page's "Compare with…" opens the comparison with that wafer ticked, waiting for a second.
    await page.goto(pathToFileURL(path.join(site.dir, "wafers", "TQ-2405", "index.html")).href);
    await Promise.all([page.waitForURL(/\/compare\/index\.html\?w=TQ-2405$/), page.click("text=Compare with…")]);
    expect(await page.isChecked('input[name=w][value="TQ-2405"]')).toBe(true);
    expect(await page.textContent("#compare-status")).toContain("Choose at least 2 wafers");
    await page.close();
  });

  it("logged no console error on any page", () => expect(errors).toEqual([]));
});
