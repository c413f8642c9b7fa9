import { mulberry32Floats } from '../random';

/** Floats in [0, 1) from a seed (mulberry32; see src/core/random). */
export function randomMulberry32(seed: number): () => number {
  return mulberry32Floats(seed);
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
