import { defineConfig } from "vitest/config";
export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // Generous: the suite must pass on a busy 2-core machine (browser and build tests slow down several-fold).
    testTimeout: 180_000,
    hookTimeout: 300_000,
    // One folder per run for the demo site that read-only tests share (test/helpers/demoSite.ts builds it on first use).
    globalSetup: ["test/globalSetup.ts"],
    pool: "forks",
    // Two files at a time (vitest's default on 2 cores is one): most of the slow files wait on
    // child builds and the browser, so two overlap well; the suite is written to stay correct when busy.
    maxWorkers: 2,
  },
});
