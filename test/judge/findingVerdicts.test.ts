/**
 * Findings count (issue 15 §2): a raised finding is a judged check with the
 * consequence its grade sets (default when unset), so a wafer cannot pass
 * beside an open finding unless its grade makes it a note or a waiver names it.
 * Limits are invented test values; the metric values sit inside them.
 */
import { describe, expect, it } from "vitest";
import { readYaml } from "../../src/read/frontMatter.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { judgeWafer } from "../../src/judge/verdict.ts";
import type { FindingCheck, FindingKey } from "../../src/judge/findings.ts";
import { FINDING_KEYS } from "../../src/judge/findings.ts";
import type { Waiver } from "../../src/validate/wafer.ts";

const text = `default_grade: qubit
grades:
  qubit:
    peak_mobility: { min: "1e5 cm^2/(V s)" }
  test:
    peak_mobility: { min: "3e4 cm^2/(V s)" }
    findings:
      incoherent_well: note
      one_sign_field: fail
`;
const targets = validateTargets(readYaml(text, "targets.yaml"), "targets.yaml", text);
const values = { peak_mobility: { perDevice: { HB1: 1.5e5 } } };

/** Every finding checked and clear, except those given with where they were raised. */
function checks(raised: Partial<Record<FindingKey, string[]>> = {}, unchecked: FindingKey[] = []): FindingCheck[] {
  return FINDING_KEYS.map((key) =>
    unchecked.includes(key) ? { key, checked: false, raised: [], why: "no data" } : { key, checked: true, raised: raised[key] ?? [] },
  );
}
const judge = (grade: string, c: FindingCheck[], waivers: Waiver[] = []) => judgeWafer(values, grade, targets, waivers, false, [], c);

describe("findings as judged checks", () => {
  it("all findings clear: pass, each finding row says pass with what was checked", () => {
    const j = judge("qubit", checks());
    expect(j.verdict).toBe("pass");
    expect(j.findings.map((f) => f.verdict)).toEqual(FINDING_KEYS.map(() => "pass"));
    expect(j.findings[0].reason).toBe("the well is coherent");
  });

  it("an incoherent well fails a wafer whose metrics all pass (default consequence: fail), and says why first", () => {
    const j = judge("qubit", checks({ incoherent_well: ["a.png: in-plane mismatch -1.134 % exceeds ±0.25 %: the well is not coherent"] }));
    expect(j.metrics.find((m) => m.key === "peak_mobility")!.verdict).toBe("pass");
    expect(j.verdict).toBe("fail");
    expect(j.reasons[0]).toBe("Incoherent well: a.png: in-plane mismatch -1.134 % exceeds ±0.25 %: the well is not coherent");
    expect(j.findings.find((f) => f.key === "incoherent_well")).toMatchObject({ verdict: "fail", consequence: "fail", fromGrade: false });
  });

  it("defaults: one-sign field, undetermined fit and coarse profile make the wafer marginal; critical thickness and parallel conduction fail it", () => {
    for (const k of ["one_sign_field", "fit_undetermined", "coarse_profile"] as const) expect(judge("qubit", checks({ [k]: ["x"] })).verdict).toBe("marginal");
    for (const k of ["beyond_critical_thickness", "parallel_conduction"] as const) expect(judge("qubit", checks({ [k]: ["x"] })).verdict).toBe("fail");
  });

  it("the grade sets the consequence: a note lets the wafer pass and is listed as a note; fail overrides a marginal default", () => {
    const noted = judge("test", checks({ incoherent_well: ["not coherent"] }));
    expect(noted.verdict).toBe("pass");
    expect(noted.findings.find((f) => f.key === "incoherent_well")).toMatchObject({ verdict: "noted", consequence: "note", fromGrade: true });
    expect(noted.reasons).toEqual(["note: Incoherent well: not coherent (a note for this grade)"]);
    expect(judge("test", checks({ one_sign_field: ["device HB1: 6 sweeps"] })).verdict).toBe("fail");
  });

  it("a waiver naming the finding waives it, with who, when and why; a waiver naming another finding does not", () => {
    const waiver: Waiver = {
      finding: "incoherent_well",
      reason: "strain relaxed by design for this test stack",
      approved_by: "R. Adeyemi",
      date: "2025-01-10",
    };
    const j = judge("qubit", checks({ incoherent_well: ["not coherent"] }), [waiver]);
    expect(j.verdict).toBe("waived");
    expect(j.reasons[0]).toBe("waived by R. Adeyemi on 2025-01-10: strain relaxed by design for this test stack (was fail: Incoherent well: not coherent)");
    expect(judge("qubit", checks({ parallel_conduction: ["x"] }), [waiver]).verdict).toBe("fail");
  });

  it("a finding that could not be checked is unmeasured and does not change the verdict", () => {
    const j = judge("qubit", checks({}, ["incoherent_well"]));
    expect(j.verdict).toBe("pass");
    expect(j.findings[0]).toMatchObject({ verdict: "unmeasured", reason: "not checked: no data" });
  });

  it("TQ-2406's case: the grade has no limit on the in-plane mismatch, yet the incoherent well still fails the wafer", () => {
    const only = validateTargets(
      readYaml('grades:\n  test:\n    peak_mobility: { min: "3e4 cm^2/(V s)" }\n', "targets.yaml"),
      "targets.yaml",
      'grades:\n  test:\n    peak_mobility: { min: "3e4 cm^2/(V s)" }\n',
    );
    const j = judgeWafer(
      { ...values, interface_inplane_mismatch: { perDevice: {}, wafer: -1.134 } },
      "test",
      only,
      [],
      false,
      [],
      checks({ incoherent_well: ["in-plane mismatch -1.134 % exceeds ±0.25 %"] }),
    );
    expect(j.metrics.find((m) => m.key === "interface_inplane_mismatch")!.verdict).toBe("recorded");
    expect(j.verdict).toBe("fail");
  });
});
