// The build summary line (src/cli/report.ts): verdict counts in one fixed order whatever order the
// wafers came in. Expectations are this program's own documented output (README "Command line").
import { describe, expect, it } from "vitest";
import { summary } from "../../src/cli/report.ts";
import type { BuildResult } from "../../src/cli/build.ts";

const result = (verdicts: string[]) => ({ outcomes: verdicts.map((v) => ({ judgement: { verdict: v } })), problems: [{ severity: "error" }, { severity: "warning" }, { severity: "warning" }] }) as unknown as BuildResult;

describe("build summary", () => {
  it("lists verdicts best first, the same for any wafer order", () => {
    const a = summary(result(["error", "fail", "pass", "untested", "pass", "marginal", "waived", "incomplete"]), 1.23);
    const b = summary(result(["pass", "incomplete", "waived", "marginal", "pass", "untested", "fail", "error"]), 1.23);
    expect(a).toBe("8 wafers (2 pass, 1 marginal, 1 waived, 1 fail, 1 incomplete, 1 untested, 1 error); 1 input error, 2 warnings; 1.2 s");
    expect(b).toBe(a);
  });
  it("leaves out verdicts no wafer has, and says none for no wafers", () => {
    expect(summary(result(["fail", "pass"]), 0)).toMatch(/^2 wafers \(1 pass, 1 fail\);/);
    expect(summary(result([]), 0)).toMatch(/^0 wafers \(none\);/);
  });
});
