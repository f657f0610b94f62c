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

/**
 * Files of test/reliability, test/cli and test/bench that build (in this process or through the command line) but
 * hold no state a later file could see: no shared demo site (its run folder comes from the integration project's
 * global setup), no environment variable set, no memory measured, no browser, no server left running. They share one
 * module graph per worker (the build's code and Eleventy are loaded once per worker instead of once per file).
 */
const SHARED_BUILD_FILES = [
  "test/bench/smoke.test.ts",
  "test/cli/args.test.ts",
  "test/cli/check.test.ts",
  "test/cli/incremental.test.ts",
  "test/cli/init.test.ts",
  "test/cli/initShards.test.ts",
  "test/cli/slimEntry.test.ts",
  "test/cli/strictTemplates.test.ts",
  "test/reliability/badInputs.test.ts",
  "test/reliability/cacheChecksum.test.ts",
  "test/reliability/echoCap.test.ts",
  "test/reliability/forgedHistory.test.ts",
  "test/reliability/ids.test.ts",
  "test/reliability/inertRaw.test.ts",
  "test/reliability/nothingLost.test.ts",
  "test/reliability/outputGuard.test.ts",
  "test/reliability/outputSwap.test.ts",
  "test/reliability/rawRetention.test.ts",
  "test/reliability/readOnce.test.ts",
  "test/reliability/reproducible.test.ts",
  "test/reliability/siteNames.test.ts",
  "test/reliability/siteWideErrors.test.ts",
  "test/reliability/workingNames.test.ts",
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
          name: "builds",
          include: SHARED_BUILD_FILES,
          isolate: false,
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["test/**/*.test.ts"],
          exclude: [...UNIT.map((d) => `${d}/**`), ...UNIT_FILES, ...SHARED_BUILD_FILES],
          // One folder per run for the demo site that read-only tests share (test/helpers/demoSite.ts builds it on first use).
          globalSetup: ["test/globalSetup.ts"],
        },
      },
    ],
  },
});
