/**
 * Seeded pseudo-random numbers for synthetic data: mulberry32 uniform generator
 * and Box–Muller normal deviates, plus Poisson deviates (Knuth's product method
 * for small means, normal approximation above 50). Deterministic per seed.
 */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function seededGaussian(seed: number): () => number {
  const uni = seededUniform(seed);
  return () => Math.sqrt(-2 * Math.log(uni() + 1e-300)) * Math.cos(2 * Math.PI * uni());
}

/** Poisson deviate generator with a given seed; mean ≤ 0 gives 0. */
export function seededPoisson(seed: number): (mean: number) => number {
  const uni = seededUniform(seed);
  const gauss = seededGaussian(seed ^ 0x9e3779b9);
  return (mean: number) => {
    if (!(mean > 0)) return 0;
    if (mean > 50) return Math.max(0, Math.round(mean + Math.sqrt(mean) * gauss()));
    const limit = Math.exp(-mean);
    let k = 0;
    let p = uni();
    while (p > limit) {
      k++;
      p *= uni();
    }
    return k;
  };
}
