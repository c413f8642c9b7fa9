/**
 * Seeded randomness for the corpus generator. The core is mulberry32 (Tommy Ettinger's 32-bit
 * generator, public domain): tiny, fast, and good enough for picking template pieces; it is not
 * for cryptography. Every draw goes through `Random`, so one seed gives one byte-identical corpus.
 */

import { mulberry32Next } from '../../src/core/random';

export { mulberry32Next };

/** Mix a seed with a stream name so independent parts (texts, each annotator) draw apart. */
export function seedDerive(seed: number, stream: string): number {
  // FNV-1a over the stream name, folded into the seed; the constants are FNV's 32-bit ones.
  let hash = 0x811c9dc5 ^ (seed >>> 0);
  for (let i = 0; i < stream.length; i++) {
    hash ^= stream.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193);
  }
  return hash >>> 0;
}

export class Random {
  private state: number;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Next unsigned 32-bit integer. */
  uint32(): number {
    const { state, value } = mulberry32Next(this.state);
    this.state = state;
    return value;
  }

  /** Uniform float in [0, 1). */
  float(): number {
    return this.uint32() / 4294967296;
  }

  /** Uniform integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.float() * n);
  }

  chance(p: number): boolean {
    return this.float() < p;
  }

  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new RangeError('Random.pick: empty list');
    return items[this.int(items.length)] as T;
  }

  /** Pick by weight; entries are [weight, item]. */
  weighted<T>(entries: readonly (readonly [number, T])[]): T {
    let total = 0;
    for (const [weight] of entries) total += weight;
    let roll = this.float() * total;
    for (const [weight, item] of entries) {
      roll -= weight;
      if (roll < 0) return item;
    }
    const last = entries[entries.length - 1];
    if (last === undefined) throw new RangeError('Random.weighted: empty list');
    return last[1];
  }

  /** Fisher–Yates shuffle of a copy. */
  shuffle<T>(items: readonly T[]): T[] {
    const out = items.slice();
    for (let i = out.length - 1; i > 0; i--) {
      const j = this.int(i + 1);
      const swap = out[i] as T;
      out[i] = out[j] as T;
      out[j] = swap;
    }
    return out;
  }
}
