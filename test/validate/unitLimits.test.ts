// Unit texts that once made the reading slow (patterns backtracking over long runs of spaces or
// digits), crash (brackets nested thousands deep overflowing the stack) or silently wrong (powers
// so large the factor underflowed to 0). Each must come back at once as a refusal that says why.
// No timing assert (performance lives in bench/); the inputs are 10 kB, so a regression to the old
// quadratic or cubic patterns would show as a test that never ends rather than a slow pass.
// Limits: UNIT_LIMITS in src/physics/unitTable.ts (200 characters, 8 brackets deep, powers ±12: common practice).
import { describe, expect, it } from "vitest";
import { readTable } from "../../src/read/table.ts";
import { readUnit } from "../../src/validate/unitGrammar.ts";
import { normaliseUnit, normaliseUnitText } from "../../src/validate/unitSpelling.ts";
import { parseQuantity, splitValueUnit, unitFactor } from "../../src/validate/units.ts";

const SPACES = " ".repeat(10_000);
const MIXED = " \t".repeat(5_000);
const DIGITS = "1".repeat(10_000);

function refused(text: unknown, target: string): string {
  const r = parseQuantity(text, target);
  if (r.ok) throw new Error(`${JSON.stringify(text)} was accepted as ${r.value}`);
  return r.found;
}

describe("long runs are refused at once, saying why", () => {
  it("spaces or tabs inside a quantity", () => {
    expect(refused(`0.6 V${SPACES}x`, "V")).toContain("more than the 200 a unit may have");
    expect(refused(`0.6 V${MIXED}x`, "V")).toContain("too long to be a quantity");
    expect(refused(`a${SPACES}b`, "V")).toContain("10002 characters");
  });

  it("a long number", () => {
    expect(refused(`${DIGITS} V`, "V")).toContain("more than the 200");
    expect(refused(`${"1".repeat(150)} V`, "V")).toContain("a number of 150 digits, more than the 60");
    expect(refused(`${"1".repeat(150)}`, "%")).toContain("a number of 150 digits");
    expect(splitValueUnit(`${DIGITS}x`)).toBeUndefined();
    expect(splitValueUnit(`1${SPACES}x`)).toBeUndefined();
  });

  it("the spelling helpers return long texts unread, and the grammar refuses them", () => {
    expect(normaliseUnit(`a${SPACES}b`)).toBe(`a${SPACES}b`);
    expect(normaliseUnitText(`${DIGITS}x`)).toBe(`${DIGITS}x`);
    expect(unitFactor("field", `T${SPACES}x`)).toBeUndefined();
    const r = readUnit(`m${SPACES}s`);
    expect(r.ok ? "accepted" : r.reason).toBe("the unit has 10002 characters, more than the 200 a unit may have");
  });

  it("within the limit, white space runs are still read (one space each) and per square is still dropped", () => {
    expect(normaliseUnit(`ohm${" ".repeat(150)}/ sq`)).toBe("ohm");
    expect(normaliseUnit("ohm \t per \t square")).toBe("ohm");
    expect(normaliseUnit(`a${" \t".repeat(90)}b`)).toBe("a b");
  });

  it("a column header with a long unit is a located header problem", () => {
    let message = "";
    try {
      readTable(`B [T${SPACES}x],Rxx [ohm]\n0.1,2\n0.2,3\n`, "long.csv");
    } catch (e) {
      message = String(e instanceof Error ? e.message : e);
    }
    expect(message).toContain("long.csv");
    expect(message).toContain("the unit of column B is too long to be a unit");
  });
});

describe("brackets and powers", () => {
  it("deep brackets are refused, not a stack overflow", () => {
    // 150 deep is within the length limit; the reading would have recursed 300 frames.
    const deep = `${"(".repeat(95)}degC${")".repeat(95)}`;
    expect(refused(`800 ${deep}`, "K")).toContain("brackets more than 8 deep");
    const r = readUnit(`${"(".repeat(6000)}K${")".repeat(6000)}`);
    expect(r.ok).toBe(false);
    expect(refused(`800 ${"(".repeat(6000)}degC${")".repeat(6000)}`, "K")).toContain("too long to be a quantity");
  });

  it("eight deep is still read", () => {
    const r = parseQuantity(`2 ${"(".repeat(8)}mm${")".repeat(8)}`, "m");
    expect(r).toEqual({ ok: true, value: 2e-3 });
  });

  it("powers beyond ±12 are refused (mm^100/km^100 was read as 0 V)", () => {
    expect(refused("0.6 V mm^100/km^100", "V")).toContain("the power ^100 is beyond ±12");
    expect(refused("1 m^9007199254740993 m^-9007199254740992", "m")).toContain("is beyond ±12");
    expect(refused("1 (m^12)^2", "m")).toContain("the power of m comes to 24, beyond ±12");
    // ±12 itself is read: mm^12 = 1e-36 m^12 (by hand).
    const r = readUnit("mm^12");
    expect(r.ok && r.unit.decade).toBe(-36);
    expect(readUnit("m^-12").ok).toBe(true);
  });

  it("a factor to SI outside the normal doubles is refused", () => {
    // pm^12 fs^12 = 1e-144 × 1e-180 = 1e-324 (by hand), below the smallest normal double 2^-1022 ≈ 2.2e-308.
    const r = readUnit("pm^12 fs^12");
    expect(r.ok ? "accepted" : r.reason).toContain("its factor to SI units (1e-324) is beyond the range");
    // pm^12 alone is 1e-144: read.
    expect(readUnit("pm^12").ok).toBe(true);
  });
});

describe("a nonzero number too small for a double is refused, not read as 0", () => {
  it("1e-400 (below 5e-324, the smallest double) with a unit, a percentage or a plain number", () => {
    for (const [text, target] of [
      ["1e-400 sccm", "sccm"],
      ["0.5e-330 V", "V"],
      ["1e-400 %", "%"],
      ["1e-400", "1"],
    ])
      expect(refused(text, target)).toBe(
        `${JSON.stringify(text)}, below the smallest number (about 5e-324), so it would read as 0; write 0 if zero is meant, or the value in a smaller unit`,
      );
    // Zero written in any form is still zero, and a small number a double holds is read.
    for (const zero of ["0 sccm", "0.000e-400 sccm", "-0e5 sccm"]) {
      const r = parseQuantity(zero, "sccm");
      expect(r.ok && Math.abs(r.value)).toBe(0);
    }
    expect(parseQuantity("1e-300 V", "V")).toEqual({ ok: true, value: 1e-300 });
  });
});
