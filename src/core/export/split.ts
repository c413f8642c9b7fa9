import { arrayShuffle, randomMulberry32 } from './random';

export type SplitPart = 'train' | 'dev' | 'test';
export const SPLIT_PARTS: readonly SplitPart[] = ['train', 'dev', 'test'];

export type SplitRatios = Readonly<Record<SplitPart, number>>;

export interface SplitOptions {
  ratios: SplitRatios;
  /** Integer seed (taken modulo 2^32): the same seed and data give the same split. */
  seed: number;
}

/** Positions in the selection, each list in the selection's order. */
export type SplitAssignment = Record<SplitPart, number[]>;

const SUM_TOLERANCE = 1e-9;

/** Why the ratios or seed are unusable, in words for the export screen; null when they are fine. */
export function splitOptionsProblem(options: SplitOptions): string | null {
  if (!Number.isSafeInteger(options.seed)) return `the seed must be a whole number, got ${options.seed}`;
  for (const part of SPLIT_PARTS) {
    const ratio = options.ratios[part];
    if (!Number.isFinite(ratio) || ratio < 0) return `the ${part} ratio must be a number of at least 0, got ${ratio}`;
  }
  const sum = SPLIT_PARTS.reduce((total, part) => total + options.ratios[part], 0);
  if (Math.abs(sum - 1) > SUM_TOLERANCE) return `the ratios must add up to 1, they add up to ${sum}`;
  return null;
}

/**
 * Largest-remainder (Hamilton) apportionment of `size` items to the parts (common practice, no
 * source): each count is within 1 of ratio × size. Ties between equal remainders are broken by
 * `random`, so many small strata do not all favour the same part.
 */
export function splitCounts(size: number, ratios: SplitRatios, random: () => number): Record<SplitPart, number> {
  const sum = SPLIT_PARTS.reduce((total, part) => total + ratios[part], 0);
  const exact = SPLIT_PARTS.map((part) => (ratios[part] / sum) * size);
  const counts = exact.map(Math.floor);
  let left = size - counts.reduce((a, b) => a + b, 0);
  const order = SPLIT_PARTS.map((part, i) => ({ i, remainder: (exact[i] ?? 0) - (counts[i] ?? 0), tie: random(), ratio: ratios[part] }))
    .filter((p) => p.ratio > 0)
    .sort((a, b) => b.remainder - a.remainder || a.tie - b.tie);
  // Rounding error can leave one more seat than there are positive remainders: go round again.
  for (let k = 0; left > 0 && order.length > 0; k++, left--) {
    const i = order[k % order.length]?.i ?? 0;
    counts[i] = (counts[i] ?? 0) + 1;
  }
  return { train: counts[0] ?? 0, dev: counts[1] ?? 0, test: counts[2] ?? 0 };
}

/**
 * Split positions 0..keys.length-1 into train/dev/test, stratified by key (the intent; utterances
 * without one form their own stratum): each stratum is shuffled with the seeded generator and cut
 * by `splitCounts`. Strata are visited in order of first appearance, so the result is deterministic.
 */
export function splitAssign(keys: readonly (string | undefined)[], options: SplitOptions): SplitAssignment {
  const problem = splitOptionsProblem(options);
  if (problem !== null) throw new RangeError(`split: ${problem}`);
  const strata = new Map<string | undefined, number[]>();
  keys.forEach((key, position) => {
    const members = strata.get(key);
    if (members === undefined) strata.set(key, [position]);
    else members.push(position);
  });
  const random = randomMulberry32(options.seed);
  const partOf = new Uint8Array(keys.length);
  for (const members of strata.values()) {
    const counts = splitCounts(members.length, options.ratios, random);
    arrayShuffle(members, random);
    members.forEach((position, k) => {
      partOf[position] = k < counts.train ? 0 : k < counts.train + counts.dev ? 1 : 2;
    });
  }
  const assignment: SplitAssignment = { train: [], dev: [], test: [] };
  partOf.forEach((part, position) => assignment[SPLIT_PARTS[part] ?? 'test'].push(position));
  return assignment;
}
