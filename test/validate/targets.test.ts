/**
 * targets.yaml messages, pinned by exact text: each names the file, the line
 * (from the YAML text) and field, what was expected, what was found and how to
 * fix it (DEVELOPERS.md, "One error type"). The limits are invented test values.
 */
import { describe, expect, it } from "vitest";
import { readYaml } from "../../src/read/frontMatter.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { problemMessage } from "../helpers/problems.ts";

const message = (text: string) => problemMessage(() => validateTargets(readYaml(text, "targets.yaml"), "targets.yaml", text));

const GRADES = 'grades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)" }\n';
const BASELINE_FIX = "write baseline: { first: 8 }, baseline: { from: 2024-01-01, to: 2024-12-31 } with both dates, or baseline: all";
const BASELINE_EXPECTED = "expected { first: N } or { from: YYYY-MM-DD, to: YYYY-MM-DD } (growth dates)";

describe("targets.yaml messages", () => {
  const cases: [string, string, string][] = [
    [
      "grades missing: located at the top of the file",
      "default_grade: test\n",
      "targets.yaml:1: grades: no grades (expected a mapping of grade name → metric limits, found nothing) — add at least one grade",
    ],
    [
      "grades empty: the same message, not a default-grade one",
      "default_grade: test\ngrades: {}\n",
      "targets.yaml:2: grades: no grades (expected a mapping of grade name → metric limits, found an empty mapping) — add at least one grade",
    ],
    [
      "default grade not defined",
      "default_grade: qubit\n" + GRADES,
      'targets.yaml:1: default_grade: default grade is not one of the grades (expected test, found "qubit") — name one of the grades defined below',
    ],
    [
      "grade that is not a mapping",
      "grades:\n  test: 5\n",
      'targets.yaml:2: grades.test: grade must map metrics to limits (expected metric: { min: "…" }, found 5) — indent the grade\'s metrics under "test:", one per line, such as peak_mobility: { min: "1e5 cm^2/(V s)" }',
    ],
    [
      "limit that is not a mapping",
      "grades:\n  test:\n    peak_mobility: 5\n",
      'targets.yaml:3: grades.test.peak_mobility: limit must be a mapping (expected { min: "…" }, { max: "…" } or { between: ["…", "…"] }, found 5) — write the limit in braces with its unit, such as peak_mobility: { min: "…" }',
    ],
    [
      "between with one value",
      'grades:\n  test:\n    peak_mobility: { between: ["1e4 cm^2/(V s)"] }\n',
      'targets.yaml:3: grades.test.peak_mobility.between: between needs two values (expected [low, high], found a list of 1) — give the low and the high limit with units in brackets, such as between: ["0.1 V", "0.6 V"]',
    ],
    [
      "guard band of 150 %",
      'grades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)", guard: "150 %" }\n',
      'targets.yaml:3: grades.test.peak_mobility.guard: cannot read the guard band (expected a percentage between 0 and 100, such as "5 %", or an amount with the metric\'s unit, found "150 %") — write a percentage from 0 up to (not including) 100, such as guard: "5 %"',
    ],
    [
      "required as a quoted word",
      'grades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)", required: "yes" }\n',
      'targets.yaml:3: grades.test.peak_mobility.required: required must be true or false (expected true or false, found "yes") — write required: true or required: false, without quotes',
    ],
    // Keys inside a limit are located at the metric's line (the field names the key), in block style too.
    [
      "unknown aggregate, block style",
      'grades:\n  test:\n    peak_mobility:\n      min: "1e4 cm^2/(V s)"\n      aggregate: median\n',
      'targets.yaml:3: grades.test.peak_mobility.aggregate: unknown aggregate (expected mean | min | max | every-device, found "median") — use one of mean, min, max, every-device',
    ],
  ];
  for (const [name, text, expected] of cases) {
    it(name, () => expect(message(text)).toBe(expected));
  }
});

describe("trends: block messages", () => {
  const cases: [string, string, string][] = [
    [
      "trends that is not a mapping",
      GRADES + "trends: 8\n",
      "targets.yaml:4: trends: trends must be a mapping (expected baseline and run_length, found 8) — indent baseline: and run_length: under trends:, or remove the trends: line for the defaults",
    ],
    [
      "run length of 1",
      GRADES + "trends:\n  run_length: 1\n",
      "targets.yaml:5: trends.run_length: run length must be a whole number from 2 to 50 (expected e.g. 8 (or 9), found 1) — write a whole number without quotes or unit, such as run_length: 8",
    ],
    [
      "baseline as an unknown word",
      GRADES + "trends:\n  baseline: recent\n",
      `targets.yaml:5: trends.baseline: cannot read the trend baseline (${BASELINE_EXPECTED}, found "recent") — ${BASELINE_FIX}`,
    ],
    [
      "baseline with from but no to",
      GRADES + "trends:\n  baseline:\n    from: 2024-01-01\n",
      `targets.yaml:5: trends.baseline: cannot read the trend baseline (${BASELINE_EXPECTED}, found a mapping) — ${BASELINE_FIX}`,
    ],
    [
      "baseline of one wafer",
      GRADES + "trends:\n  run_length: 8\n  baseline: { first: 1 }\n",
      "targets.yaml:6: trends.baseline.first: baseline needs at least 2 wafers (expected a whole number ≥ 2, found 1) — write a whole number of wafers, 2 or more, such as baseline: { first: 8 }",
    ],
    [
      "baseline dates reversed",
      GRADES + "trends:\n  baseline: { from: 2024-12-31, to: 2024-01-01 }\n",
      "targets.yaml:5: trends.baseline: baseline dates are reversed (expected from before to, found 2024-12-31 … 2024-01-01) — swap them",
    ],
  ];
  for (const [name, text, expected] of cases) {
    it(name, () => expect(message(text)).toBe(expected));
  }
});
