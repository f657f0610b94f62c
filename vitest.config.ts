import { defineConfig } from "vitest/config";

/** Pure unit tests: no builds, no child processes, no global state; they share one module graph per worker. */
const UNIT = ["test/analyse", "test/read", "test/validate", "test/judge", "test/publish", "test/physics", "test/model"];

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
          include: UNIT.map((d) => `${d}/**/*.test.ts`),
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
          exclude: UNIT.map((d) => `${d}/**`),
          // One folder per run for the demo site that read-only tests share (test/helpers/demoSite.ts builds it on first use).
          globalSetup: ["test/globalSetup.ts"],
        },
      },
    ],
  },
});
