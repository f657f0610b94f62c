/**
 * The relation page draws log axes where src/model/metricScale.ts says a quantity is log-like (mobility,
 * densities, τ_q, contaminant peaks), and linear axes for every other variable: checked on the chart the page
 * drew, in Debian's Chromium (Chart.js's scale type of each axis, "logarithmic" or "linear"), for every
 * variable the page offers, on x and on y. The "linear" choice of the Axes control makes both linear.
 */
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { logAxis } from "../../src/model/metricScale.ts";
import { startSite, type Site } from "./harness.ts";

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

/** A linear quantity of every demo wafer with a profile, to pair each variable with. */
const LINEAR = "well_thickness";

async function open(query: string): Promise<Page> {
  const page = await ctx.newPage();
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(`${page.url()}: ${m.text()}`);
  });
  page.on("pageerror", (e) => errors.push(`${page.url()}: ${e.message}`));
  await page.goto(`${site.origin}/relation/${query}`, { waitUntil: "load" });
  await page.waitForFunction(() => /plotted/.test(document.getElementById("relation-status")?.textContent ?? ""));
  return page;
}

/** The type of each axis of the chart drawn on the relation canvas now (null when nothing is drawn). */
async function axisTypes(page: Page): Promise<{ x: string; y: string } | null> {
  return page.evaluate(() => {
    const chart = (window as unknown as { Chart: { getChart: (c: Element) => { scales: Record<string, { type: string }> } | undefined } }).Chart.getChart(
      document.getElementById("relation-canvas")!,
    );
    return chart ? { x: chart.scales.x.type, y: chart.scales.y.type } : null;
  });
}

describe("relation page axes in the browser", () => {
  it("mobility against density: both axes logarithmic, and the title says so", { timeout: 120_000 }, async () => {
    const page = await open("?x=density_at_peak_mobility&y=peak_mobility");
    expect(await axisTypes(page)).toEqual({ x: "logarithmic", y: "logarithmic" });
    expect(await page.textContent("#relation-title")).toMatch(/\(both axes logarithmic\)$/);
    // The Axes control's "linear" draws both linear.
    await page.selectOption("#r-scale", "linear");
    await page.waitForFunction(() => !/logarithmic/.test(document.getElementById("relation-title")?.textContent ?? ""));
    expect(await axisTypes(page)).toEqual({ x: "linear", y: "linear" });
    await page.close();
  });

  it("every variable the page offers gets the scale metricScale.ts decides, on x and on y", { timeout: 300_000 }, async () => {
    const page = await open(`?x=${LINEAR}&y=${LINEAR}`);
    const keys = await page.locator("#r-x option").evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
    expect(keys).toContain("peak_mobility");
    expect(keys.filter((k) => logAxis(k)).length).toBeGreaterThanOrEqual(4);
    const wrong: string[] = [];
    for (const key of keys) {
      const want = logAxis(key) ? "logarithmic" : "linear";
      for (const [axis, other] of [
        ["x", "y"],
        ["y", "x"],
      ] as const) {
        await page.selectOption(`#r-${other}`, LINEAR);
        await page.selectOption(`#r-${axis}`, key);
        const types = await axisTypes(page);
        if (types === null) continue; // no wafer has both values: nothing drawn
        if (types[axis] !== want) wrong.push(`${key} on ${axis}: ${types[axis]}, expected ${want}`);
        if (key !== LINEAR && types[other] !== "linear") wrong.push(`${LINEAR} on ${other} beside ${key}: ${types[other]}`);
      }
    }
    expect(wrong).toEqual([]);
    await page.close();
  });

  it("logged no console error", () => expect(errors).toEqual([]));
});
