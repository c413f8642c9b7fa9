/**
 * mulberry32, Tommy Ettinger's public-domain 32-bit generator (constants from memory; the corpus
 * tests check this stream against a C build of the same steps): tiny, fast and seedable, so every
 * seeded feature (sample corpus, splits, bootstrap) reproduces exactly. Not for secrets.
 */

/** One step: the next state and its unsigned 32-bit output. */
export function mulberry32Next(state: number): { state: number; value: number } {
  const next = (state + 0x6d2b79f5) | 0;
  let t = next;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return { state: next, value: (t ^ (t >>> 14)) >>> 0 };
}

/** A stream of floats in [0, 1) from a seed. */
export function mulberry32Floats(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    const step = mulberry32Next(state);
    state = step.state;
    return step.value / 4294967296;
  };
}
