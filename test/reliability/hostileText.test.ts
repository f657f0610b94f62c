/**
 * Nothing runs that shouldn't: text typed into records, file names and
 * metadata carrying <script>, <img onerror>, javascript: links and
 * quote-breaking strings is escaped on every page; chart JSON cannot close its
 * <script> tag (jsonForScript, used by every page model); every page has the
 * Content-Security-Policy meta allowing only the site's own scripts and styles;
 * and in headless Chromium no dialog opens, no data script runs, no console
 * error appears and no request leaves the site.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { build } from "../../src/cli/build.ts";
import { jsonForScript } from "../../src/publish/charts.ts";
import { renderNotes } from "../../src/publish/markdown.ts";
import { HEALTHY_DIR, io } from "./corpus.ts";

const X = {
  script: "<script>window.__pwned=1;alert('script')</script>",
  img: "<img src=x onerror=\"window.__pwned=2;alert('img')\">",
  quote: "\"'><svg onload=alert('svg')>",
  close: "</script><script>alert('close')</script>",
  link: "[click me](javascript:alert('link'))",
  amp: "&lt;script&gt;alert('entity')&lt;/script&gt;",
};
const ALL = Object.values(X).join(" ");
const CSP = `<meta http-equiv="Content-Security-Policy" content="default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data:; connect-src 'self'; object-src 'none'; base-uri 'none'; form-action 'self'">`;
const yamlString = (s: string) => JSON.stringify(s);
const HOSTILE_FILE = "q'\"><img src=x onerror=alert('file')>.csv";

let tmp: string;
let out: string;
beforeAll(async () => {
  tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-xss-"));
  const data = path.join(tmp, "data");
  await fs.cp(HEALTHY_DIR, data, { recursive: true });
  const w = path.join(data, "wafers", "EVIL-1.a_b");
  await fs.mkdir(path.join(w, "transport"), { recursive: true });
  await fs.mkdir(path.join(w, "xrd"), { recursive: true });
  await fs.mkdir(path.join(data, "runs"), { recursive: true });
  const sweep = await fs.readFile(path.join(data, "wafers/OK-1/transport/vg_0p50V.csv"), "utf8");
  await fs.writeFile(path.join(w, "transport", "vg_0p50V.csv"), `# operator: ${X.script}\n# sample: ${X.quote}\n` + sweep);
  await fs.writeFile(path.join(w, "transport", HOSTILE_FILE), sweep.replace("0.50 V", "0.80 V"));
  await fs.writeFile(path.join(w, "transport", "broken.csv"), `# gate: 0.5 V\nB [T],${"Rxx<script>"} [ohm]\n1,2\n`);
  await fs.writeFile(path.join(w, "xrd", "p.csv"), `# reflection: 0 0 4\nlayer,omega [deg],two_theta [deg]\n${JSON.stringify(X.close)},34.5,69.1\n`);
  await fs.writeFile(
    path.join(w, "wafer.md"),
    `---
wafer: EVIL-1.a_b
run: R1
grown: 2024-05-02
reactor: ${yamlString(X.img)}
title: ${yamlString(X.quote + X.close)}
stack:
  - { name: ${yamlString(X.script)}, role: well, material: ${yamlString(X.img)}, ge: 0, thickness_nm: 10 }
  - { name: ${yamlString(X.quote)}, role: buffer, material: ${yamlString(X.close)}, ge: 0.3, thickness_nm: 3000 }
devices:
  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 20, files: "transport/*.csv" }
xrd: { files: "xrd/*.csv" }
waivers:
  - { metric: peak_mobility, reason: ${yamlString(X.img + X.link)}, approved_by: ${yamlString(X.quote)}, date: 2024-06-01 }
---

# Notes ${X.script}

${X.img}

${X.link} and [ok](https://example.invalid/) and <a href="javascript:alert('raw')">raw</a>

${X.quote} ${X.close} ${X.amp}
`,
  );
  await fs.writeFile(
    path.join(data, "runs", "R1.md"),
    `---\nreactor: ${yamlString(X.script)}\nstarted: ${yamlString(X.img)}\nnote: ${yamlString(X.quote)}\n---\n\n${ALL}\n`,
  );
  out = path.join(tmp, "site");
  const r = await build({ data, out, strict: false, basePath: "/", quiet: true }, io);
  expect(r.ok).toBe(true);
}, 120_000);

afterAll(async () => {
  if (!process.env.KEEP) await fs.rm(tmp, { recursive: true, force: true });
});

async function pages(): Promise<string[]> {
  const found: string[] = [];
  async function walk(sub: string): Promise<void> {
    for (const e of await fs.readdir(path.join(out, sub), { withFileTypes: true })) {
      const rel = sub ? `${sub}/${e.name}` : e.name;
      if (e.isDirectory()) await walk(rel);
      else if (rel.endsWith(".html")) found.push(rel);
    }
  }
  await walk("");
  return found.sort();
}

describe("escaping in the built pages", () => {
  it("no markup from data survives: only the site's own script tags, no event handlers, no javascript: links", async () => {
    const list = await pages();
    expect(list).toContain("wafers/EVIL-1.a_b/index.html");
    expect(list).toContain("runs/R1/index.html");
    for (const p of list) {
      const html = await fs.readFile(path.join(out, p), "utf8");
      expect(html.startsWith("<!doctype html>"), p).toBe(true);
      expect(html, p).toContain(CSP);
      const scripts = html.match(/<script\b[^>]*>/gi) ?? [];
      for (const s of scripts) expect(s, p).toMatch(/^<script (src="\/assets\/[A-Za-z.-]+\.js" defer|type="application\/json" id="(chart|relation)-data")>$/);
      expect(html.match(/<script type="application\/json" id="(chart|relation)-data">/g)?.length ?? 0, p).toBeLessThanOrEqual(1);
      // Between the JSON block's tags there is no "<" at all (the relation page's data block, built by the same jsonForScript, too).
      const json = /<script type="application\/json" id="(?:chart|relation)-data">([\s\S]*?)<\/script>/.exec(html);
      if (json) {
        expect(json[1]).not.toContain("<");
        expect(() => JSON.parse(json[1])).not.toThrow();
      }
      // Every real tag (escaped text holds no "<" or ">") is free of event-handler attributes.
      for (const tag of html.match(/<[a-z][^<>]*>/gi) ?? []) expect(tag.replace(/"[^"]*"/g, '""'), p).not.toMatch(/\son[a-z]+\s*=/i);
      expect(html, p).not.toMatch(/(href|src)\s*=\s*["']?\s*javascript:/i);
      expect(html, p).not.toMatch(/<(img|svg|iframe|object|embed)\b[^>]*\bsrc=x/i);
    }
  });

  it("the hostile text is shown, escaped, on the wafer and run pages", async () => {
    const wafer = await fs.readFile(path.join(out, "wafers/EVIL-1.a_b/index.html"), "utf8");
    expect(wafer).toContain("&lt;script&gt;window.__pwned=1;alert(&#39;script&#39;)&lt;/script&gt;");
    expect(wafer).toContain("&lt;img src=x onerror=");
    expect(wafer).toContain("[click me](javascript:alert(");
    const run = await fs.readFile(path.join(out, "runs/R1/index.html"), "utf8");
    expect(run).toContain("&lt;script&gt;window.__pwned=1");
  });

  it("the raw copy of the hostile file is named by its SHA-256 only; the name appears escaped as link text and download name", async () => {
    const results = JSON.parse(await fs.readFile(path.join(out, "wafers/EVIL-1.a_b/results.json"), "utf8"));
    expect(results.wafer).toBe("EVIL-1.a_b");
    const f = results.provenance.files.find((x: { path: string }) => x.path.endsWith(HOSTILE_FILE));
    expect(f).toBeDefined();
    const raw = await fs.readdir(path.join(out, "raw"));
    expect(raw).toContain(`${f.sha256}.csv`);
    expect(raw.every((n) => /^[0-9a-f]{64}(\.[a-z0-9]{1,10})?$/.test(n))).toBe(true);
    const page = await fs.readFile(path.join(out, "wafers/EVIL-1.a_b/index.html"), "utf8");
    expect(page).toContain(`href="../../raw/${f.sha256}.csv" download="q&#39;&quot;&gt;&lt;img src=x onerror=alert(&#39;file&#39;)&gt;.csv"`);
  });
});

describe("serialisers for script blocks", () => {
  const value = { label: X.close, more: "a\u2028b\u2029c & <!-- -->", n: [1, 2] };
  it("jsonForScript escapes <, >, & and line separators and round-trips", () => {
    const s = jsonForScript(value);
    expect(s).not.toMatch(/[<>&\u2028\u2029]/);
    expect(JSON.parse(s)).toEqual(value);
  });
  it("notes are rendered with raw HTML disabled and unsafe link schemes refused", () => {
    const html = renderNotes(`${X.script}\n\n${X.link}\n\n[d](data:text/html,x) [v](vbscript:x) [ok](https://a.invalid/)`);
    expect(html).not.toMatch(/<script|<img|href="(javascript|data|vbscript):/);
    expect(html).toContain('href="https://a.invalid/"');
  });
});

describe("in headless Chromium", () => {
  it("no dialog, no data script, no console error, no request outside the site", async () => {
    const { chromium } = await import("playwright-core");
    // Loaded here, like playwright-core, so the other tests of this file never load the browser harness.
    const { serve, CHROMIUM, LAUNCH_ARGS } = await import("../browser/harness.ts");
    const { origin, server } = await serve(out);
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: LAUNCH_ARGS });
    try {
      const page = await browser.newPage();
      const dialogs: string[] = [];
      const errors: string[] = [];
      const outside: string[] = [];
      page.on("dialog", (d) => {
        dialogs.push(d.message());
        void d.dismiss();
      });
      page.on("console", (m) => {
        if (m.type() === "error") errors.push(m.text());
      });
      page.on("pageerror", (e) => errors.push(String(e)));
      page.on("request", (r) => {
        if (!r.url().startsWith(origin) && !r.url().startsWith("data:")) outside.push(r.url());
      });
      for (const p of ["wafers/EVIL-1.a_b/", "runs/R1/", "", "wafers/OK-1/", "targets/"]) {
        await page.goto(`${origin}/${p}`, { waitUntil: "load" });
        await page.waitForTimeout(300);
        expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned), p).toBeUndefined();
        // The page's own chart script ran (when the page has charts) despite the CSP.
        if (p.startsWith("wafers/")) expect(await page.locator("canvas").count(), p).toBeGreaterThan(0);
      }
      expect(dialogs).toEqual([]);
      expect(errors).toEqual([]);
      expect(outside).toEqual([]);
    } finally {
      await browser.close();
      server.close();
    }
  }, 120_000);
});
