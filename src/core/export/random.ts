/**
 * mulberry32, Tommy Ettinger's public-domain 32-bit generator (from memory; the same constants as
 * `mulberry32` in src/core/agreement): small, fast, seedable. Returns floats in [0, 1). Not for secrets.
 */
export function randomMulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) | 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Fisher–Yates shuffle in place (Knuth, TAOCP vol. 2, Algorithm P), driven by `random`. */
export function arrayShuffle<T>(items: T[], random: () => number): T[] {
  for (let i = items.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    const a = items[i] as T;
    items[i] = items[j] as T;
    items[j] = a;
  }
  return items;
}
