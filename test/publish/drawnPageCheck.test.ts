/**
 * The allow-lists a drawn page read back from the cache must pass before it
 * is published (src/publish/drawnPageCheck.ts, preparedMarkup.ts, safeUrl.ts):
 * what waferbook's own renderers write passes (Markdown notes of every kind;
 * the demo site's figures and notes: test/cli/demoSiteMarkup.test.ts); each trick a
 * forged page could use to run script on the site's origin is refused with
 * what was found; and every field the wafer templates place unescaped or use
 * as a link is one the check covers (read from the templates themselves).
 * The tricks are the usual ones of HTML injection (common practice: the
 * HTML standard's parsing of character references and URLs; from memory).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { markupProblem, scriptJsonProblem } from "../../src/publish/preparedMarkup.ts";
import { relativeLinkProblem, urlProblem } from "../../src/publish/safeUrl.ts";
import { drawnFileProblem, JSON_FIELD, kindOf, MARKUP_FIELD, PAGE_MODEL_FIELDS, pageModelProblem, URL_FIELD } from "../../src/publish/drawnPageCheck.ts";
import { waferPageModel } from "../../src/publish/waferPage.ts";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";
import { renderNotes } from "../../src/publish/markdown.ts";
import { jsonForScript } from "../../src/publish/charts.ts";
import { compareScriptFrame } from "../../src/publish/compareData.ts";
import { ROOT } from "../helpers/demoSite.ts";

/** A page model as waferPageModel draws it, for a small hand-made wafer (no structure, images or uniformity sections). */
function drawnModel(id = "W-1"): Record<string, unknown> {
  const targets = targetsFrom('default_grade: test\ngrades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)" }\n');
  return waferPageModel(makeOutcome({ id, devices: { d1: { peak_mobility: 2e4 } } } as never, targets));
}

const NOTES = [
  '# Heading\n\nSome *emphasis*, **strong**, ~~struck~~, `code` and a [link](https://example.org/a?b=1&c=2 "title").',
  "1. one\n2. two\n\n- a\n- b\n\n> quoted\n\n---\n\nline  \nbreak",
  "| left | centre | right |\n|:--|:-:|--:|\n| 1 | 2 | 3 |",
  "```js\nconst x = '<script>alert(1)</script>';\n```",
  "[mail](mailto:lab@example.invalid) [relative](../runs/TQ24-A/) ![pic](https://example.org/x.png) ![inline](data:image/png;base64,iVBORw0KGgo=)",
  "<script>alert(1)</script> <img src=x onerror=alert(1)> [js](javascript:alert(1)) [vb](vbscript:msgbox) [data](data:text/html,<b>x</b>) [file](file:///etc/passwd)",
  "3. starts at three\n4. four",
];

describe("what waferbook writes passes", () => {
  it("Markdown notes of every kind (the renderer escapes raw HTML and writes only allowed links)", () => {
    for (const n of NOTES) expect(markupProblem(renderNotes(n)), n).toBeUndefined();
    // Links outside the allow-list stay text: the renderer and the check agree (safeUrl.ts).
    expect(renderNotes("[x](javascript:alert(1)) [y](ftp://host/f)")).not.toMatch(/href/);
    // Table alignment is a class (an inline style would be refused by the pages' Content-Security-Policy).
    expect(renderNotes(NOTES[2])).toMatch(/<th class="align-left">left<\/th>\s*<th class="align-center">centre<\/th>\s*<th class="align-right">right<\/th>/);
    expect(renderNotes(NOTES[2])).not.toMatch(/style=/);
  });
  it("chart JSON as jsonForScript writes it, even with hostile strings", () => {
    const json = jsonForScript([{ title: "</script><script>alert(1)</script>", note: "a & b > c \u2028" }]);
    expect(scriptJsonProblem(json)).toEqual({ value: [{ title: "</script><script>alert(1)</script>", note: "a & b > c \u2028" }] });
  });
  it("a tiny PNG, and the comparison data framed for its wafer", () => {
    const png = PNG.sync.write(Object.assign(new PNG({ width: 1, height: 1 }), { data: Buffer.from([1, 2, 3, 255]) }));
    expect(drawnFileProblem("wafers/W-1/images/image1-micrograph.png", png, "W-1")).toBeUndefined();
    expect(drawnFileProblem("wafers/W-1/structure/rsm-0.png", png, "W-1")).toBeUndefined();
    const { before, after } = compareScriptFrame("W-1");
    expect(drawnFileProblem("wafers/W-1/compare.js", Buffer.from(`${before}{"id":"W-1","metrics":[]}${after}`), "W-1")).toBeUndefined();
  });
});

describe("each trick of a forged page is refused, saying what was found", () => {
  const markup: [string, RegExp][] = [
    ["<script>alert(1)</script>", /element <script>/],
    ['<p>x</p><SCRIPT SRC="evil.js"></SCRIPT>', /element <SCRIPT>/],
    ["<img src=x onerror=alert(1)>", /not a plain tag/],
    ['<img src="x.png" onerror="alert(1)">', /attribute onerror.*event handler/],
    ['<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"></svg>', /attribute onload/],
    ['<a href="javascript:alert(1)">x</a>', /scheme "javascript:"/],
    ['<a href=" JaVaScRiPt:alert(1)">x</a>', /scheme "JaVaScRiPt:"/],
    ['<a href="java&#9;script:alert(1)">x</a>', /scheme "javascript:"/],
    ['<a href="&#106;avascript:alert(1)">x</a>', /scheme "javascript:"/],
    ['<a href="&#x6A;avascript&#58alert(1)">x</a>', /scheme "javascript:"/],
    ['<a href="javascript&colon;alert(1)">x</a>', /character reference &colon;/],
    ['<a href="data:text/html,&lt;script&gt;">x</a>', /scheme "data:"/],
    ['<svg><image href="vbscript:x"/></svg>', /scheme "vbscript:"/],
    ['<iframe src="evil.html"></iframe>', /element <iframe>/],
    ['<object data="x.swf"></object>', /element <object>/],
    ['<embed src="x">', /element <embed>/],
    ['<meta http-equiv="refresh" content="0;url=https://evil.example">', /element <meta>/],
    ['<base href="https://evil.example/">', /element <base>/],
    ["<style>body{display:none}</style>", /element <style>/],
    ['<p style="background:url(https://evil.example/)">x</p>', /attribute style/],
    ["<!-- --><p>x</p>", /not a plain tag/],
    ["<svg><foreignObject><p>x</p></foreignObject></svg>", /element <foreignObject>/],
    ['<svg><use href="#x"/></svg>', /element <use>/],
    ['<svg><animate attributeName="href" to="javascript:alert(1)"/></svg>', /element <animate>/],
    ["<p>never closed", /<p> is never closed/],
    ["</div></section><p>x</p>", /element <div>/],
    ["<p>x</strong>", /<\/strong> .* where <\/p> was expected/],
    ["<p/>", /self-closing/],
    ["<textarea>", /element <textarea>/],
  ];
  for (const [html, why] of markup) {
    it(`markup ${JSON.stringify(html)}`, () => expect(markupProblem(html)).toMatch(why));
  }

  it("links in model fields: only relative paths, http(s), mailto and inline pictures", () => {
    for (const ok of ["../../raw/ab.csv", "images/x.png", "/qual/wafers/X/", "https://example.org/", "mailto:a@b", "#notes", "?q=a:b", "a/b:c"])
      expect(urlProblem(ok), ok).toBeUndefined();
    for (const bad of ["javascript:alert(1)", "\u0001javascript:x", "vbscript:x", "file:///etc/passwd", "data:text/html,x", "ftp://h/f", "jav\nascript:x"])
      expect(urlProblem(bad), bad).toMatch(/scheme/);
  });

  it("the page model: the id, every unescaped field, every link field", () => {
    const good = {
      ...drawnModel(),
      id: "W-1",
      notesHtml: "<p>x</p>",
      chartsJson: jsonForScript([{ links: ["../W-2/"] }]),
      files: [{ href: "../../raw/a.csv" }],
      structure: { stackSvg: "<svg></svg>", maps: [{ svg: "<svg></svg>" }] },
    };
    expect(pageModelProblem(good, "W-1")).toBeUndefined();
    const bad: [object, RegExp][] = [
      [{ ...good, id: "../../index" }, /for "..\/..\/index", not for "W-1"/],
      [{ ...good, notesHtml: '<p>x</p><script src="evil.js"></script>' }, /^notesHtml: the element <script>/],
      [{ ...good, notesHtml: ["<script>"] }, /notesHtml is a object, not text/],
      [{ ...good, chartsJson: '[]</script><script src="evil.js"></script>' }, /^chartsJson: the chart data hold a raw "<"/],
      [{ ...good, chartsJson: jsonForScript([{ links: ["javascript:alert(1)"] }]) }, /^chartsJson\.0\.links\.0: .*javascript/],
      [{ ...good, files: [{ href: "javascript:alert(1)" }] }, /^files\.0\.href: .*javascript/],
      [{ ...good, images: { images: [{ micrograph: { src: "data:text/html,x" } }] } }, /micrograph\.src: .*data/],
      [{ ...good, structure: { maps: [{ svg: '<svg onload="alert(1)"></svg>' }] } }, /^structure\.maps\.0\.svg: .*onload/],
      [{ ...good, uniformity: { maps: [{ svg: '<svg><a href="javascript:x"><text>x</text></a></svg>' }] } }, /uniformity\.maps\.0\.svg: .*javascript/],
    ];
    for (const [model, why] of bad) expect(pageModelProblem(model, "W-1")).toMatch(why);
    expect(pageModelProblem("a string", "W-1")).toMatch(/not an object/);
  });

  it("the page model holds only plain objects, lists and primitives: a Set, Map, Date… is refused wherever it is", () => {
    const good = drawnModel();
    const svg = '<svg><script>alert(1)</script></svg><meta http-equiv="refresh" content="0;url=https://evil.example/">';
    class Section {
      svg = "<svg></svg>";
    }
    const bad: [Record<string, unknown>, RegExp][] = [
      // The forger's case: a Set that Nunjucks iterates, holding markup a check of objects alone never reads.
      [{ ...good, uniformity: { maps: new Set([{ key: "u", svg }]) } }, /^uniformity\.maps is a Set, which waferbook's drawing never writes/],
      [{ ...good, uniformity: { maps: new Map([["0", { svg }]]) } }, /^uniformity\.maps is a Map/],
      [{ ...good, metrics: [{ name: new Date(0) }] }, /^metrics\.0\.name is a Date/],
      [{ ...good, metrics: [{ name: /x/ }] }, /^metrics\.0\.name is a RegExp/],
      [{ ...good, grade: Object("test") }, /^grade is a String/],
      [{ ...good, stack: [new Uint8Array(4)] }, /^stack\.0 is a Uint8Array/],
      [{ ...good, structure: new Section() }, /^structure is an Object/],
      [{ ...good, charts: [Object.assign(Object.create([]), { 0: "x" })] }, /^charts\.0 is a/],
    ];
    for (const [model, why] of bad) expect(pageModelProblem(model, "W-1")).toMatch(why);
    // After a round trip through v8 (how the cache holds the model), as the build reads it.
    const forged = v8.deserialize(v8.serialize({ ...good, uniformity: { maps: new Set([{ svg }]) } })) as unknown;
    expect(pageModelProblem(forged, "W-1")).toMatch(/^uniformity\.maps is a Set/);
    // A model with a null prototype is still a plain object.
    expect(pageModelProblem(Object.assign(Object.create(null), good), "W-1")).toBeUndefined();
  });

  it("the page model has every field the drawing writes, of its kind (the templates throw on an undefined output)", () => {
    const fresh = drawnModel();
    expect(Object.keys(fresh).sort()).toEqual(Object.keys(PAGE_MODEL_FIELDS).sort());
    for (const [key, kinds] of Object.entries(PAGE_MODEL_FIELDS)) {
      const kind = kindOf(fresh[key]);
      expect(kinds.replace(/\?$/, "").split("|").includes(kind) || (kind === "undefined" && kinds.endsWith("?")), `${key}: ${kind} vs ${kinds}`).toBe(true);
    }
    expect(pageModelProblem(v8.deserialize(v8.serialize(fresh)), "W-1")).toBeUndefined();
    const { toc: _t, metrics: _m, verdict: _v, ...dropped } = fresh;
    expect(pageModelProblem(dropped, "W-1")).toMatch(/^the page model has no field toc, which every drawn page has/);
    const { verdict: _v2, ...noVerdict } = fresh;
    expect(pageModelProblem(noVerdict, "W-1")).toMatch(/no field verdict/);
    expect(pageModelProblem({ ...fresh, metrics: "not a list" }, "W-1")).toMatch(/field metrics is a text, not list/);
    expect(pageModelProblem({ ...fresh, toc: 5 }, "W-1")).toMatch(/field toc is a number, not list/);
    expect(pageModelProblem({ ...fresh, decision: undefined }, "W-1")).toMatch(/no field decision/);
    expect(pageModelProblem({ ...fresh, structure: "x" }, "W-1")).toMatch(/field structure is a text, not object \(or undefined\)/);
    // Optional sections may be absent, as a wafer without them is drawn.
    const { structure: _s, ...noStructure } = fresh;
    expect(pageModelProblem(noStructure, "W-1")).toBeUndefined();
  });

  it("notes carry no id (it could take the chart data's name); links in the model and the charts stay on the site", () => {
    const good = drawnModel();
    for (const n of NOTES) expect(renderNotes(n)).not.toMatch(/\s(id|name)=/);
    // The hijack: a paragraph named like the chart data, placed before it.
    expect(pageModelProblem({ ...good, notesHtml: '<p id="chart-data">[{&quot;links&quot;:[]}]</p>' }, "W-1")).toMatch(/^notesHtml: the attribute id=/);
    expect(markupProblem('<p ID="x">y</p>', { ids: false })).toMatch(/attribute ID=/);
    // Figures keep their ids (titles, clip paths and gradients refer to them).
    expect(pageModelProblem({ ...good, uniformity: { maps: [{ svg: '<svg><title id="m-t">x</title></svg>' }] } }, "W-1")).toBeUndefined();
    // Notes may still link off the site, as Markdown writes them; the drawing's own links may not.
    expect(pageModelProblem({ ...good, notesHtml: '<p><a href="https://example.org/">x</a></p>' }, "W-1")).toBeUndefined();
    const off: [Record<string, unknown>, RegExp][] = [
      [{ ...good, chartsJson: jsonForScript([{ links: ["https://evil.example/"] }]) }, /^chartsJson\.0\.links\.0: .*leads off the site/],
      [{ ...good, charts: [{ series: [{ links: ["//evil.example/"] }] }] }, /^charts\.0\.series\.0\.links\.0: .*leads off the site/],
      [{ ...good, files: [{ href: "https://evil.example/a.csv" }] }, /^files\.0\.href: .*leads off the site/],
      [{ ...good, files: [{ href: "/\\evil.example/a.csv" }] }, /leads off the site/],
      [{ ...good, images: { images: [{ micrograph: { src: "mailto:a@b" } }] } }, /micrograph\.src: .*leads off the site/],
    ];
    for (const [model, why] of off) expect(pageModelProblem(model, "W-1")).toMatch(why);
    for (const ok of ["../../raw/ab.csv", "images/x.png", "/qual/wafers/X/", "#notes", "?q=a:b", "a/b:c", "../W-2/"])
      expect(relativeLinkProblem(ok), ok).toBeUndefined();
  });

  it("the chart script finds its data as the script element, not by id alone", async () => {
    const js = await fs.readFile(path.join(ROOT, "templates", "assets", "charts.js"), "utf8");
    expect(js).toContain("document.querySelector('script[type=\"application/json\"]#chart-data')");
    expect(js).not.toMatch(/getElementById\(\s*["']chart-data/);
  });

  it("files: only compare.js as written for this wafer and well-formed PNG pictures", () => {
    const png = PNG.sync.write(Object.assign(new PNG({ width: 1, height: 1 }), { data: Buffer.from([1, 2, 3, 255]) }));
    const { before, after } = compareScriptFrame("W-1");
    const bad: [string, Buffer, RegExp][] = [
      ["wafers/W-1/evil.js", Buffer.from("alert(1)"), /never draws/],
      ["wafers/W-1/index.html", Buffer.from("<script>alert(1)</script>"), /never draws/],
      ["wafers/W-1/structure/x.svg", Buffer.from("<svg onload=alert(1)>"), /never draws/],
      ["wafers/W-1/images/x.png", Buffer.from("<script>alert(1)</script>"), /not a PNG picture/],
      ["wafers/W-1/images/x.png", Buffer.concat([png, Buffer.from("<script>alert(1)</script>")]), /bytes after the PNG's end/],
      [
        "wafers/W-1/images/x.png",
        (() => {
          const b = Buffer.from(png);
          b[20] ^= 1;
          return b;
        })(),
        /fails its CRC/,
      ],
      ["wafers/W-1/images/x.png", png.subarray(0, png.length - 12), /no end chunk/],
      ["wafers/W-1/compare.js", Buffer.from(`${before}{"id":"W-1"};alert(1)${after}`), /more than one JSON value/],
      ["wafers/W-1/compare.js", Buffer.from(`alert(1);${before}{"id":"W-1"}${after}`), /not the comparison data/],
      ["wafers/W-1/compare.js", Buffer.from(`${before}{"id":"W-1","x":"</script>"}${after}`), /raw "<"/],
      ["wafers/W-1/compare.js", Buffer.from(`${before}{"id":"W-2"}${after}`), /the data of "W-2"/],
    ];
    for (const [rel, bytes, why] of bad) expect(drawnFileProblem(rel, bytes, "W-1"), rel).toMatch(why);
  });
});

describe("the check covers every field the wafer templates place unescaped or use as a link", () => {
  it("reads templates/wafer.njk and its sections", async () => {
    const dir = path.join(ROOT, "templates");
    const files = ["wafer.njk", ...(await fs.readdir(path.join(dir, "_includes", "sections"))).map((f) => `_includes/sections/${f}`)];
    const unescaped = new Set<string>();
    const links = new Set<string>();
    for (const f of files) {
      const t = await fs.readFile(path.join(dir, f), "utf8");
      for (const m of t.matchAll(/\{\{\s*([\w.[\]]+)\s*\|\s*safe\s*\}\}/g)) unescaped.add(m[1].split(".").at(-1)!);
      for (const m of t.matchAll(/(?:href|src|action)="\{\{\s*([^}|]+?)\s*\}\}"/g)) links.add(m[1].split(".").at(-1)!);
    }
    expect(unescaped.size).toBeGreaterThan(2);
    for (const key of unescaped) expect(MARKUP_FIELD(key) || JSON_FIELD(key), key).toBe(true);
    for (const key of links) expect(URL_FIELD(key), key).toBe(true);
  });
});
