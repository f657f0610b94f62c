/**
 * Charts and pages that can be read (issue 18 §3–4), in Debian's Chromium on
 * the demo site of the shared harness: log–log ticks and padding, ρxx and Rxy
 * on their own axes with every gate voltage, the oscillation view, the
 * reciprocal-space maps, legends that match what is drawn, wafer-map label
 * sizes, SVG text inside its figure (getBBox), the section index, the printed
 * report (Chromium's PDF, at most 4 A4 pages) and search snippets.
 * Sources: the issue's own requirements; "1-2-5 per decade" is common practice.
 */
import { promises as fs, readFileSync } from "node:fs";
import path from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OUTPUT, ROOT, startSite, type Site } from "./harness.ts";

/** The demo wafer with every section: transport in depth, uniformity, X-ray maps, depth profile, lattice images. */
const WAFER = "TQ-2401";
const SUPERSCRIPT = "⁰¹²³⁴⁵⁶⁷⁸⁹⁻";

let site: Site;
let ctx: BrowserContext;
const problems: string[] = [];

async function open(url: string): Promise<Page> {
  const page = await ctx.newPage();
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(`${url}: ${m.text()}`);
  });
  page.on("pageerror", (e) => problems.push(`${url}: ${e.message}`));
  await page.addInitScript(() => document.addEventListener("securitypolicyviolation", (e) => console.error(`CSP: ${e.violatedDirective} ${e.blockedURI}`)));
  await page.goto(url, { waitUntil: "load" });
  await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
  return page;
}
const waferUrl = (id: string) => `${site.origin}/wafers/${id}/`;
/**
 * WAFER's page, opened once and shared by the tests that only read it (its largest page, so loading
 * and drawing it once instead of six times is most of this file's time); a test that changes a chart's
 * view changes nothing another test reads. The printed report opens its own page.
 */
let waferPage: Page | undefined;
async function wafer(): Promise<Page> {
  waferPage ??= await open(waferUrl(WAFER));
  return waferPage;
}

beforeAll(async () => {
  site = await startSite();
  ctx = await site.browser.newContext({ viewport: { width: 1280, height: 900 } });
});
afterAll(async () => {
  await ctx?.close();
  await site?.close();
});

describe("charts (§3)", () => {
  it("log–log mobility chart: ticks at 1, 2, 5 per decade with readable labels, no point on the frame", async () => {
    const page = await wafer();
    const r = await page.evaluate(() => {
      const chart = (window as unknown as { Chart: { getChart(c: Element): any } }).Chart.getChart(
        document.querySelector('canvas[data-chart="mobility-vs-density"]')!,
      );
      const axis = (k: string) => ({ values: chart.scales[k].ticks.map((t: any) => t.value), labels: chart.scales[k].ticks.map((t: any) => String(t.label)) });
      const a = chart.chartArea;
      const margins: number[] = [];
      for (const ds of chart.data.datasets)
        for (const p of ds.data) {
          const x = chart.scales.x.getPixelForValue(p.x);
          const y = chart.scales.y.getPixelForValue(p.y);
          margins.push(x - a.left, a.right - x, y - a.top, a.bottom - y);
        }
      return { x: axis("x"), y: axis("y"), margins, types: [chart.scales.x.type, chart.scales.y.type] };
    });
    expect(r.types).toEqual(["logarithmic", "logarithmic"]);
    const mantissa = (v: number) => Number((v / 10 ** Math.floor(Math.log10(v) + 1e-9)).toPrecision(3));
    for (const axis of [r.x, r.y]) {
      expect(axis.values.length).toBeGreaterThanOrEqual(3);
      // Every tick is labelled, as "10⁵", "2×10⁵" or a plain number.
      for (const l of axis.labels) expect(l).toMatch(new RegExp(`^((\\d+(\\.\\d+)?×)?10[${SUPERSCRIPT}]+|\\d+(\\.\\d+)?)$`));
    }
    // Ticks are m × 10^k: m from 1, 2, 5 on an axis of a decade or more; on a narrower one (this wafer's
    // densities span under a decade) the whole mantissas 1…9 fill the gaps 1-2-5 would leave (chartAxes.test.ts).
    for (const axis of [r.x, r.y]) {
      const decades = Math.log10(axis.values.at(-1) / axis.values[0]);
      for (const v of axis.values) expect(decades >= 1 ? [1, 2, 5] : [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 7, 8, 9]).toContain(mantissa(v));
    }
    // Padding: every marker centre at least 4 px inside the plot area.
    expect(Math.min(...r.margins)).toBeGreaterThanOrEqual(4);
  });

  it("ρxx and Rxy on their own axes; every gate voltage selectable; the oscillation view with its fit", async () => {
    const page = await wafer();
    const sweeps = await page.locator("#device-HB1 table.points tbody tr").count();
    const select = page.locator('select[data-chart-view="traces-HB1"]');
    expect(await select.locator("option").count()).toBe(sweeps);
    expect(await page.locator(`label[for="${await select.getAttribute("id")}"]`).textContent()).toMatch(/Gate voltage/);
    const read = () =>
      page.evaluate(() => {
        const chart = (window as unknown as { Chart: { getChart(c: Element): any } }).Chart.getChart(
          document.querySelector('canvas[data-chart="traces-HB1"]')!,
        );
        const rho = chart.data.datasets.find((d: any) => d.yAxisID === "y");
        const rxy = chart.data.datasets.find((d: any) => d.yAxisID === "y2");
        const ys = rho.data.map((p: any) => p.y);
        return {
          titles: [chart.scales.y.options.title.text, chart.scales.y2.options.title.text],
          rhoSpan: (Math.max(...ys) - Math.min(...ys)) / (chart.scales.y.max - chart.scales.y.min),
          first: ys.slice(0, 5).join(","),
          rxyLast: rxy.data.at(-1).y,
          caption: document.querySelector('[data-chart-view-caption="traces-HB1"]')!.textContent,
        };
      });
    const before = await read();
    expect(before.titles).toEqual(["ρxx (Ω/□)", "|Rxy| (kΩ)"]);
    // ρxx fills its own axis (not a flat line on a shared one): it spans at least a third of it.
    expect(before.rhoSpan).toBeGreaterThan(0.33);
    expect(before.rxyLast).toBeGreaterThan(0.1);
    await select.selectOption({ index: 0 });
    const after = await read();
    expect(after.first).not.toBe(before.first);
    expect(after.caption).not.toBe(before.caption);
    const osc = await page.evaluate(() => {
      const chart = (window as unknown as { Chart: { getChart(c: Element): any } }).Chart.getChart(
        document.querySelector('canvas[data-chart="depth-osc-HB1"]')!,
      );
      return {
        labels: chart.data.datasets.map((d: any) => d.label),
        x: chart.scales.x.options.title.text,
        n: chart.data.datasets.map((d: any) => d.data.length),
        views: document.querySelectorAll('select[data-chart-view="depth-osc-HB1"] option').length,
      };
    });
    expect(osc.labels).toEqual(["ρxx − fitted background (data)", "Lifshitz–Kosevich fit"]);
    expect(osc.x).toMatch(/1\/B/);
    expect(Math.min(...osc.n)).toBeGreaterThan(20);
    expect(osc.views).toBeGreaterThanOrEqual(2);
  });

  it("reciprocal-space maps: a smooth picture, a colour bar, ticks in nm⁻¹, the full-strain and full-relaxation lines labelled", async () => {
    const page = await wafer();
    const maps = await page.evaluate(async () =>
      Promise.all(
        [...document.querySelectorAll<SVGSVGElement>("svg.rsm-svg")].map(async (svg) => {
          const href = svg.querySelector("image")!.getAttribute("href")!;
          const img = new Image();
          img.src = new URL(href, location.href).href;
          await img.decode();
          const texts = [...svg.querySelectorAll("text")].map((t) => (t.textContent ?? "").trim());
          return {
            size: [img.naturalWidth, img.naturalHeight],
            ticks: texts.filter((t) => /^−?\d+(\.\d+)?$/.test(t)).length,
            texts,
            stops: svg.querySelectorAll("linearGradient stop").length,
            title: svg.querySelector("title")!.textContent,
          };
        }),
      ),
    );
    expect(maps.length).toBe(2);
    for (const m of maps) {
      expect(Math.min(...m.size)).toBeGreaterThanOrEqual(100); // not 44 coarse blocks
      expect(m.ticks).toBeGreaterThanOrEqual(6);
      expect(m.texts).toEqual(expect.arrayContaining(["Qx (nm⁻¹)", "Qz (nm⁻¹)", "counts (log scale)"]));
      expect(m.stops).toBeGreaterThanOrEqual(10);
    }
    const asym = maps.find((m) => /2 2 4/.test(m.title ?? ""))!;
    expect(asym.texts).toEqual(expect.arrayContaining(["R = 0 (strained)", "R = 1 (relaxed)"]));
  });

  it("control-chart legends match what is drawn: dashed lines dashed, the target listed, markers big enough", async () => {
    const index = await open(`${site.origin}/trends/`);
    const hrefs = await index.$$eval("main a[href*='trends/']", (as) => as.map((a) => (a as HTMLAnchorElement).href));
    await index.close();
    const page = await open(hrefs.find((h) => /peak_mobility/.test(h)) ?? hrefs[0]);
    const items = await page.evaluate(() => {
      const chart = (window as unknown as { Chart: { getChart(c: Element): any } }).Chart.getChart(document.querySelector("canvas[data-chart]")!);
      return chart.legend.legendItems.map((it: any) => {
        const ds = it.datasetIndex != null ? chart.data.datasets[it.datasetIndex] : null;
        const c = it.pointStyle as HTMLCanvasElement;
        const d = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
        let ink = 0;
        for (let i = 3; i < d.length; i += 4) if (d[i] > 100) ink++;
        // Runs of paint along the middle row (dashes) and along the row 2–3 px from the top (the target band's edge).
        const runs = (y: number) => {
          let n = 0,
            on = false;
          for (let x = 0; x < c.width; x++) {
            const a = d[4 * (y * c.width + x) + 3] > 100;
            if (a && !on) n++;
            on = a;
          }
          return n;
        };
        return {
          text: it.text,
          line: ds ? !!ds.showLine : null,
          dashed: ds ? (ds.borderDash ?? []).length > 0 : null,
          radius: ds?.pointRadius ?? null,
          ink,
          mid: runs(Math.floor(c.height / 2)),
          edge: runs(2),
        };
      });
    });
    const target = items.find((i: any) => /^target/.test(i.text));
    expect(target, "the target band is listed").toBeDefined();
    expect(target.edge).toBeGreaterThanOrEqual(3); // drawn dashed, as on the chart
    const lines = items.filter((i: any) => i.line);
    expect(lines.length).toBeGreaterThanOrEqual(3); // centre line, UCL, LCL
    for (const l of lines) {
      if (l.dashed) expect(l.mid, `${l.text}: dashed in the legend`).toBeGreaterThanOrEqual(3);
      else expect(l.mid, `${l.text}: solid in the legend`).toBe(1);
    }
    for (const m of items.filter((i: any) => i.line === false)) {
      expect(m.radius, m.text).toBeGreaterThanOrEqual(4.5);
      expect(m.ink, `${m.text}: legend marker big enough to see`).toBeGreaterThanOrEqual(30);
    }
    await page.close();
  });
});

describe("figures (§3)", () => {
  it("wafer-map labels are at least 11 px at 1280 px, and each map has a colour bar with range and unit", async () => {
    const page = await wafer();
    const maps = await page.evaluate(() =>
      [...document.querySelectorAll<SVGSVGElement>("svg.wafer-map")].map((svg) => {
        const scale = svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
        return {
          sizes: [...svg.querySelectorAll("text")].map((t) => Number(t.getAttribute("font-size")) * scale),
          bar: !!svg.querySelector('.wafer-legend rect[fill^="url("]'),
          legend: [...svg.querySelectorAll(".wafer-legend text")].map((t) => t.textContent),
        };
      }),
    );
    expect(maps.length).toBeGreaterThanOrEqual(2);
    for (const m of maps) {
      expect(Math.min(...m.sizes)).toBeGreaterThanOrEqual(11);
      expect(m.bar).toBe(true);
      expect(m.legend.length).toBe(3); // low end, high end, unit
    }
  });

  it("every text of the layer stack, the maps and the wafer maps lies inside its figure (getBBox)", async () => {
    const page = await wafer();
    const outside = await page.evaluate(() => {
      const bad: string[] = [];
      for (const svg of document.querySelectorAll<SVGSVGElement>("svg.stack-svg, svg.rsm-svg, svg.wafer-map")) {
        const vb = svg.viewBox.baseVal;
        const frame = svg.getBoundingClientRect();
        for (const t of svg.querySelectorAll<SVGTextElement>("text")) {
          if (t.hasAttribute("transform")) {
            // Rotated axis titles: their box on screen against the figure's.
            const r = t.getBoundingClientRect();
            if (r.left < frame.left - 0.5 || r.right > frame.right + 0.5 || r.top < frame.top - 0.5 || r.bottom > frame.bottom + 0.5)
              bad.push(`${svg.getAttribute("class")}: "${t.textContent}"`);
            continue;
          }
          const b = t.getBBox();
          if (b.x < vb.x - 0.5 || b.y < vb.y - 0.5 || b.x + b.width > vb.x + vb.width + 0.5 || b.y + b.height > vb.y + vb.height + 0.5)
            bad.push(`${svg.getAttribute("class")}: "${t.textContent}" at ${b.x.toFixed(1)}…${(b.x + b.width).toFixed(1)} of ${vb.width}`);
        }
      }
      return bad;
    });
    expect(outside).toEqual([]);
    // The measured values the figure used to clip are there in full.
    expect(await page.locator("svg.stack-svg text", { hasText: /^measured Ge \d\.\d+/ }).count()).toBeGreaterThanOrEqual(1);
  });
});

describe("pages for reading and for paper (§4)", () => {
  it("'On this page' lists the sections, and every entry leads to one", async () => {
    const page = await wafer();
    const r = await page.evaluate(() =>
      [...document.querySelectorAll<HTMLAnchorElement>("nav.on-this-page a")].map((a) => ({
        id: a.hash.slice(1),
        ok: !!document.getElementById(a.hash.slice(1)),
      })),
    );
    expect(r.filter((e) => !e.ok)).toEqual([]);
    expect(r.map((e) => e.id)).toEqual(
      expect.arrayContaining(["summary", "metrics", "transport", "uniformity", "structure", "images", "notes", "appendix", "provenance", "history"]),
    );
  });

  it("a wafer report prints on at most 4 A4 pages without navigation, with its provenance footer; the appendix is left out with a note saying so", async () => {
    // The wafer with every section and the demo wafer with the largest page (most tables and reasons).
    const sizes = await Promise.all(
      (await fs.readdir(path.join(site.dir, "wafers"))).map(async (id) => ({
        id,
        bytes: (await fs.stat(path.join(site.dir, "wafers", id, "index.html"))).size,
      })),
    );
    const largest = sizes
      .sort((a, b) => b.bytes - a.bytes)
      .slice(0, 1)
      .map((s) => s.id);
    // WAFER's shared page goes last to print: nothing reads it after this test.
    for (const id of new Set([...largest.filter((l) => l !== WAFER), WAFER])) {
      const page = id === WAFER ? await wafer() : await open(waferUrl(id));
      await page.emulateMedia({ media: "print" });
      expect(await page.isVisible(".print-note")).toBe(true);
      expect(await page.textContent(".print-note")).toMatch(/Left out of the printed report/);
      for (const sel of ["#appendix-sweeps", "#transport-depth", "#history", "nav.on-this-page"])
        expect(await page.isVisible(sel), `${id}: ${sel} printed`).toBe(false);
      expect(await page.isVisible("#metrics")).toBe(true);
      // A report, not a screen: no navigation or search; the footer and provenance print. A wafer page's footer
      // names the waferbook version, not a build time (pages are reused unchanged: docs/scaling.md).
      for (const sel of ["header.top", "nav.crumbs", "#site-search"]) expect(await page.isVisible(sel), `${id}: ${sel} printed`).toBe(false);
      for (const sel of ["footer.foot", "#provenance", "#wafer-title"]) expect(await page.isVisible(sel), `${id}: ${sel} not printed`).toBe(true);
      expect(await page.textContent("footer.foot")).toMatch(/Wafer page by waferbook \d+\.\d+\.\d+/);
      const pdf = await page.pdf({ format: "A4", printBackground: true });
      expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
      expect(pdf.length).toBeGreaterThan(20_000);
      if (id === WAFER) await fs.writeFile(path.join(OUTPUT, "wafer.pdf"), pdf);
      const pages = (pdf.toString("latin1").match(/\/Type\s*\/Page(?![a-zA-Z])/g) ?? []).length;
      expect(pages, `${id} prints on ${pages} A4 pages`).toBeGreaterThanOrEqual(1);
      expect(pages, `${id} prints on ${pages} A4 pages`).toBeLessThanOrEqual(4);
      if (id !== WAFER) await page.close();
    }
  });

  it("search results show a snippet around the match with the matched words marked, built from text nodes", async () => {
    const page = await open(`${site.origin}/search/?q=buffer`);
    const r = await page.evaluate(() =>
      [...document.querySelectorAll("#search-results .snippet")].map((p) => ({
        marks: [...p.querySelectorAll("mark")].map((m) => (m.textContent ?? "").toLowerCase()),
        elements: [...p.children].map((c) => c.tagName),
        length: (p.textContent ?? "").length,
      })),
    );
    expect(r.length).toBeGreaterThanOrEqual(1);
    for (const s of r) {
      expect(s.marks.length).toBeGreaterThanOrEqual(1);
      expect(s.marks.every((m) => m === "buffer")).toBe(true);
      expect(new Set(s.elements)).toEqual(new Set(["MARK"]));
      expect(s.length).toBeLessThanOrEqual(160);
    }
    // Untrusted note text is never parsed as HTML by the search script.
    expect(readFileSync(path.join(ROOT, "templates", "assets", "search.js"), "utf8")).not.toMatch(/innerHTML|insertAdjacentHTML|outerHTML/);
    await page.close();
  });

  it("the pages keep their Content-Security-Policy and log no errors or CSP violations", async () => {
    const html = await fs.readFile(path.join(site.dir, "wafers", WAFER, "index.html"), "utf8");
    expect(html).toMatch(/<meta http-equiv="Content-Security-Policy" content="default-src 'self'; script-src 'self';/);
    expect(html).not.toMatch(/<script(?![^>]*(src=|type="application\/json"))/);
    expect(problems).toEqual([]);
  });
});
