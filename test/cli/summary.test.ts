// The build summary line (src/cli/report.ts): verdict counts in one fixed order whatever order the
// wafers came in. Expectations are this program's own documented output (README "Command line").
import { describe, expect, it } from "vitest";
import { cacheLine, summary } from "../../src/cli/report.ts";
import { countText } from "../../src/model/format.ts";
import type { BuildResult } from "../../src/cli/build.ts";

const result = (verdicts: string[]) =>
  ({
    outcomes: verdicts.map((v) => ({ judgement: { verdict: v } })),
    problems: [{ severity: "error" }, { severity: "warning" }, { severity: "warning" }],
  }) as unknown as BuildResult;

describe("build summary", () => {
  it("lists verdicts best first, the same for any wafer order", () => {
    const a = summary(result(["error", "fail", "pass", "unjudged", "pass", "marginal", "waived", "incomplete"]), 1.23);
    const b = summary(result(["pass", "incomplete", "waived", "marginal", "pass", "unjudged", "fail", "error"]), 1.23);
    expect(a).toBe("8 wafers (2 pass, 1 marginal, 1 waived, 1 fail, 1 incomplete, 1 unjudged, 1 error); 1 input error, 2 warnings; 1.2 s");
    expect(b).toBe(a);
  });
  it("leaves out verdicts no wafer has, and says none for no wafers", () => {
    expect(summary(result(["fail", "pass"]), 0)).toMatch(/^2 wafers \(1 pass, 1 fail\);/);
    expect(summary(result([]), 0)).toMatch(/^0 wafers \(none\);/);
  });
  it('puts each count\'s noun in the right number (a one-wafer build said "1 wafers")', () => {
    const one = { outcomes: [{ judgement: { verdict: "pass" } }], problems: [{ severity: "warning" }] } as unknown as BuildResult;
    expect(summary(one, 0.5)).toBe("1 wafer (1 pass); 0 input errors, 1 warning; 0.5 s");
    expect(cacheLine({ analysed: 1, cacheHits: 0, drawn: 1, pagesFromCache: 0, pagesReused: 0 } as Parameters<typeof cacheLine>[0])).toBe(
      "analysed 1 wafer (0 from the cache); drew 1 page (0 from the cache, 0 reused from the previous site)",
    );
  });
});

describe("countText", () => {
  it("takes the singular for 1 only (English: from memory)", () => {
    expect([0, 1, 2].map((n) => countText(n, "wafer"))).toEqual(["0 wafers", "1 wafer", "2 wafers"]);
    expect(countText(1, "match", "matches")).toBe("1 match");
    expect(countText(3, "match", "matches")).toBe("3 matches");
  });
});
