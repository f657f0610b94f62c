/**
 * Benchmark: geometric phase analysis of a 1024×1024 synthetic micrograph.
 * Run with `npx tsx bench/gpa.ts`. Prints the median wall time of a few runs,
 * and the time of one Z-contrast profile of the same image for comparison.
 */
import { geometricPhase } from "../src/analyse/images/geometricPhase.ts";
import { zContrastProfile } from "../src/analyse/images/zContrastProfile.ts";
import { syntheticMicrograph } from "../src/synth/micrograph.ts";

const PX = 0.05e-9;
const size = 1024;
const t0 = performance.now();
const img = syntheticMicrograph({
  width: size,
  height: size,
  pixelSize_m: PX,
  inPlaneSpacing_m: 6.4 * PX,
  barrierSpacing_m: 7 * PX,
  wellSpacing_m: 7 * PX * (1 - 0.02006),
  wellThickness_m: 200 * PX,
  interfaceTau_m: 3 * PX,
  noise: 0.05,
  tilt_deg: 1.5,
  seed: 9,
});
const tSynth = performance.now() - t0;
const times: number[] = [];
let last: ReturnType<typeof geometricPhase> | undefined;
for (let run = 0; run < 3; run++) {
  const t = performance.now();
  last = geometricPhase(img.pixels, size, size, { growthAxis: "up" });
  times.push(performance.now() - t);
}
times.sort((a, b) => a - b);
if (!last?.ok) throw new Error(`GPA failed: ${last && !last.ok ? last.reason : "no result"}`);
console.log(`synthetic ${size}×${size} micrograph: ${tSynth.toFixed(0)} ms`);
console.log(`GPA ${size}×${size}: median ${times[1].toFixed(0)} ms (runs: ${times.map((t) => t.toFixed(0)).join(", ")} ms)`);
const tz = performance.now();
const z = zContrastProfile(img.pixels, size, size, { pixelSize_m: PX, growthAxis: "up" });
console.log(`Z-contrast profile ${size}×${size}: ${(performance.now() - tz).toFixed(0)} ms (${z.ok ? "ok" : z.reason})`);
