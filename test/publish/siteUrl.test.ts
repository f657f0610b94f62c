// Links between pages (src/publish/siteUrl.ts). Expected values are written out by hand from the
// URL layout of docs/publishing.md and relative-reference resolution (RFC 3986 §5.2, common practice).
import { describe, expect, it } from "vitest";
import { relativeRoot, siteRoot, siteUrl } from "../../src/publish/siteUrl.ts";

describe("relative links (no base path)", () => {
  it("climbs one folder per level of the linking page", () => {
    expect(relativeRoot("/")).toBe("");
    expect(relativeRoot("/runs/")).toBe("../");
    expect(relativeRoot("/wafers/TQ-2401/")).toBe("../../");
    expect(relativeRoot("/a/page.html")).toBe("../");
  });

  it("names index.html for folders (a folder URL opened from disk shows a listing) and keeps anchors", () => {
    expect(siteUrl("", "/", "")).toBe("index.html");
    expect(siteUrl("runs/", "/", "")).toBe("runs/index.html");
    expect(siteUrl("", "/wafers/TQ-2401/", "")).toBe("../../index.html");
    expect(siteUrl("runs/TQ24-A/", "/wafers/TQ-2401/", "")).toBe("../../runs/TQ24-A/index.html");
    expect(siteUrl("targets/#trend-settings", "/trends/", "")).toBe("../targets/index.html#trend-settings");
    expect(siteUrl("assets/site.css", "/search/", "")).toBe("../assets/site.css");
  });

  it("resolves, from the linking page's URL, to the target's file", () => {
    // The browser's own resolution (WHATWG URL) is the check: the link read from page P lands on the target.
    for (const [page, target, file] of [
      ["/wafers/TQ-2401/", "runs/TQ24-A/", "/runs/TQ24-A/index.html"],
      ["/trends/peak_mobility/", "wafers/TQ-2401/", "/wafers/TQ-2401/index.html"],
      ["/", "changes/", "/changes/index.html"],
      ["/changes/", "", "/index.html"],
    ])
      expect(new URL(siteUrl(target, page, ""), `file:///home/lab/site${page}`).pathname).toBe(`/home/lab/site${file}`);
  });

  it("gives scripts the root as seen from the page", () => {
    expect(siteRoot("/search/", "")).toBe("../");
    expect(siteRoot("/", "")).toBe("");
  });
});

describe("absolute links (--base)", () => {
  it("puts the base path in front and keeps tidy folder URLs", () => {
    expect(siteUrl("", "/wafers/TQ-2401/", "/qual/")).toBe("/qual/");
    expect(siteUrl("runs/TQ24-A/", "/wafers/TQ-2401/", "/qual/")).toBe("/qual/runs/TQ24-A/");
    expect(siteUrl("runs/", "/", "/")).toBe("/runs/");
    expect(siteRoot("/search/", "/qual/")).toBe("/qual/");
  });

  it("refuses a target that is not a path from the site root (a programming error)", () => {
    expect(() => siteUrl("/runs/", "/", "")).toThrow(/not a path from the site root/);
    expect(() => siteUrl("https://example.org/", "/", "")).toThrow(/not a path from the site root/);
  });
});
