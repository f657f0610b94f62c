/**
 * Issue 13 §2: published raw copies never become active content. A device
 * pattern matching .html/.svg/.xhtml files and an images entry naming an .svg
 * (none of which parses) publish those files only as raw/<SHA-256>.bin; every
 * name in raw/ has an inert extension; Markdown notes show an outside picture
 * as a link. (The browser side: test/browser/hostileRaw.test.ts.) The
 * expectations are this program's own rules (docs/formats.md §7), with the
 * allow-list written out here rather than imported.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { build } from "../../src/cli/build.ts";
import { renderNotes } from "../../src/publish/markdown.ts";
import { io } from "./corpus.ts";
import { HOSTILE, hostileData } from "./outputHelpers.ts";

const INERT = /^[0-9a-f]{64}\.(csv|tsv|txt|dat|md|png|bin)$/;
const sha = (s: string) => createHash("sha256").update(s).digest("hex");

const tempDir = useTempDir("inert");
let out = "";
beforeAll(async () => {
  const data = await hostileData(path.join(tempDir(), "data"));
  out = path.join(tempDir(), "site");
  expect((await build({ data, out, strict: false, basePath: "/", quiet: true, cache: null }, io)).ok).toBe(true);
});

describe("raw copies", () => {
  it("every published raw object has an inert extension; the hostile files are there only as .bin", async () => {
    const names = await fs.readdir(path.join(out, "raw"));
    expect(names.length).toBeGreaterThan(4);
    expect(names.filter((n) => !INERT.test(n))).toEqual([]);
    for (const text of Object.values(HOSTILE)) {
      expect(names.filter((n) => n.startsWith(sha(text)))).toEqual([`${sha(text)}.bin`]);
      expect(await fs.readFile(path.join(out, "raw", `${sha(text)}.bin`), "utf8")).toBe(text);
    }
  });

  it("the wafer page links the hostile files' .bin copies, and the wafer shows its errors", async () => {
    const page = await fs.readFile(path.join(out, "wafers", "EVIL-1", "index.html"), "utf8");
    for (const text of Object.values(HOSTILE)) expect(page).toContain(`href="../../raw/${sha(text)}.bin"`);
    expect(page).not.toMatch(/raw\/[0-9a-f]{64}\.(html?|svg|xhtml|xml|js)\b/);
    const results = JSON.parse(await fs.readFile(path.join(out, "wafers", "EVIL-1", "results.json"), "utf8"));
    expect(results.verdict).toBe("error");
  });
});

describe("Markdown notes", () => {
  it("an outside picture becomes a link labelled with its alt text; nothing on the page would fetch it", async () => {
    expect(renderNotes('See ![supplier logo](https://pictures.invalid/logo.png "their logo").')).toBe(
      '<p>See <a class="note-image" href="https://pictures.invalid/logo.png" title="their logo">[picture: supplier logo]</a>.</p>\n',
    );
    expect(renderNotes("![](//pictures.invalid/x.png)")).toBe(
      '<p><a class="note-image" href="//pictures.invalid/x.png">[picture: //pictures.invalid/x.png]</a></p>\n',
    );
    expect(renderNotes("![a](images/a.png)")).toBe('<p><a class="note-image" href="images/a.png">[picture: a]</a></p>\n');
    // An inline data: picture needs no request, and the pages' policy allows it (img-src 'self' data:).
    expect(renderNotes("![dot](data:image/png;base64,iVBORw0KGgo=)")).toBe('<p><img src="data:image/png;base64,iVBORw0KGgo=" alt="dot"></p>\n');
    const page = await fs.readFile(path.join(out, "wafers", "EVIL-1", "index.html"), "utf8");
    expect(page).toContain('<a class="note-image" href="https://pictures.invalid/logo.png" title="their logo">[picture: supplier logo]</a>');
    expect(page).not.toMatch(/<img[^>]+pictures\.invalid/);
  });
});
