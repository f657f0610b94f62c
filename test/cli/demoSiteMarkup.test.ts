/**
 * The shared demo site against the drawn-page allow-lists and the
 * Content-Security-Policy (src/publish/drawnPageCheck.ts, preparedMarkup.ts):
 * every SVG figure and notes block waferbook drew passes the check a cached
 * page must pass, and every page carries the policy and needs nothing it
 * forbids. The unit tests of the check itself are in
 * test/publish/drawnPageCheck.test.ts; these read the demo build, so they
 * live with the integration tests (one demo build per run: demoSite.ts).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { markupProblem } from "../../src/publish/preparedMarkup.ts";
import { DEMO_HOOK_TIMEOUT_MS, demoSite } from "../helpers/demoSite.ts";

describe("what waferbook drew on the demo site passes the drawn-page check", () => {
  it(
    "every SVG figure and notes block of the demo site",
    async () => {
      const site = await demoSite();
      let svgs = 0;
      let notes = 0;
      for (const id of await fs.readdir(path.join(site, "wafers"))) {
        const html = await fs.readFile(path.join(site, "wafers", id, "index.html"), "utf8").catch(() => "");
        // The figures of the page model start with xmlns (the templates' own icons do not, and are not drawn pages' content).
        for (const m of html.matchAll(/<svg xmlns[\s\S]*?<\/svg>/g)) {
          expect(markupProblem(m[0]), `${id}: ${m[0].slice(0, 80)}`).toBeUndefined();
          svgs++;
        }
        const block = /<div class="notes">([\s\S]*?)<\/div><\/section>/.exec(html);
        if (block) {
          // Notes carry no id (drawnPageCheck.ts checks them so: an id could take the chart data's name).
          expect(markupProblem(block[1], { ids: false }), id).toBeUndefined();
          notes++;
        }
      }
      // The demo has wafer maps, layer stacks and reciprocal-space maps on several wafers.
      expect(svgs).toBeGreaterThan(10);
      expect(notes).toBeGreaterThan(10);
    },
    DEMO_HOOK_TIMEOUT_MS,
  );
});

describe("every page of the demo site carries the Content-Security-Policy and needs nothing it forbids", () => {
  it(
    "the policy is the first element after the charset; scripts are files or JSON data; no handler, inline style or javascript: link",
    async () => {
      const site = await demoSite();
      const pages = [...(await fs.readdir(site, { recursive: true }))].filter((f) => f.endsWith(".html"));
      expect(pages.length).toBeGreaterThan(30);
      for (const f of pages) {
        const html = await fs.readFile(path.join(site, f), "utf8");
        expect(html, f).toMatch(
          /^<!doctype html>\s*<html lang="en">\s*<head>\s*<meta charset="utf-8">\s*<meta http-equiv="Content-Security-Policy" content="default-src 'self'; script-src 'self'; style-src 'self'; [^"]*object-src 'none'; base-uri 'none'/,
        );
        for (const s of html.matchAll(/<script\b[^>]*>/g)) expect(s[0], f).toMatch(/^<script (src="[^"]+" defer|type="application\/json" id="[\w-]+")>$/);
        expect(html, f).not.toMatch(/\son[a-z]+=|\sstyle="|javascript:/i);
      }
    },
    DEMO_HOOK_TIMEOUT_MS,
  );
});
