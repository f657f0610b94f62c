/** Deterministic pseudo-random numbers for test fixtures (the same generators the synthetic-data models use). */
export { seededUniform as uniform, seededGaussian as gaussian } from "../../src/synth/random.ts";
