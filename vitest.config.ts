import { defineConfig } from "vitest/config";

/** Pure unit tests: no builds, no child processes, no global state; they share one module graph per worker. */
const UNIT = ["test/analyse", "test/read", "test/validate", "test/judge", "test/publish", "test/physics", "test/model"];
/**
 * Files of test/reliability and test/cli that are unit tests too (they call readers, validators, analyses or
 * one helper of src/cli on a temporary folder: no build, no child process, no environment variable, no memory
 * measured), so they run without a module graph of their own. A file that starts building or spawning moves out.
 */
const UNIT_FILES = [
  "test/reliability/properties.test.ts",
  "test/reliability/csvInjection.test.ts",
  "test/reliability/instrumentCorpus.test.ts",
  "test/reliability/notNumbers.test.ts",
  "test/reliability/pixelBomb.test.ts",
  "test/cli/cacheKey.test.ts",
  "test/cli/fileHashes.test.ts",
  "test/cli/rawCopies.test.ts",
  "test/cli/summary.test.ts",
];

export default defineConfig({
  test: {
    // Generous: the suite must pass on a busy 2-core machine (browser and build tests slow down several-fold).
    testTimeout: 180_000,
    hookTimeout: 300_000,
    pool: "forks",
    // Two files at a time (vitest's default on 2 cores is one): most of the slow files wait on
    // child builds and the browser, so two overlap well; the suite is written to stay correct when busy.
    maxWorkers: 2,
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: [...UNIT.map((d) => `${d}/**/*.test.ts`), ...UNIT_FILES],
          // Without a fresh module graph per file these ~80 files take a third of the CPU time; they
          // hold no state between files (builds and measured-memory tests live in the other project).
          isolate: false,
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["test/**/*.test.ts"],
          exclude: [...UNIT.map((d) => `${d}/**`), ...UNIT_FILES],
          // One folder per run for the demo site that read-only tests share (test/helpers/demoSite.ts builds it on first use).
          globalSetup: ["test/globalSetup.ts"],
        },
      },
    ],
  },
});
