import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { randomMulberry32, splitAssign, splitCounts, splitOptionsProblem, type SplitRatios } from '../../../src/core/export';

const INTENTS = ['book_visit', 'reschedule', 'cancel', 'ask_price', 'check_status'];
const keyArb = fc.option(fc.constantFrom(...INTENTS), { nil: undefined, freq: 6 });
const keysArb = fc.array(keyArb, { maxLength: 120 });

/** Three non-negative ratios summing to 1 (zeros included, so empty parts come up). */
const ratiosArb: fc.Arbitrary<SplitRatios> = fc
  .tuple(fc.nat(20), fc.nat(20), fc.nat(20))
  .filter(([a, b, c]) => a + b + c > 0)
  .map(([a, b, c]) => ({ train: a / (a + b + c), dev: b / (a + b + c), test: c / (a + b + c) }));

const seedArb = fc.integer({ min: 0, max: 2 ** 32 - 1 });

function strata(keys: readonly (string | undefined)[]): Map<string | undefined, number[]> {
  const map = new Map<string | undefined, number[]>();
  keys.forEach((k, i) => map.set(k, [...(map.get(k) ?? []), i]));
  return map;
}

describe('splitAssign', () => {
  it('puts every utterance in exactly one part, each part in corpus order (property)', () => {
    fc.assert(
      fc.property(keysArb, ratiosArb, seedArb, (keys, ratios, seed) => {
        const { train, dev, test } = splitAssign(keys, { ratios, seed });
        const all = [...train, ...dev, ...test].sort((a, b) => a - b);
        expect(all).toEqual(keys.map((_, i) => i));
        for (const part of [train, dev, test]) expect(part).toEqual([...part].sort((a, b) => a - b));
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('keeps each stratum within 1 of ratio × stratum size, utterances without intent included (property)', () => {
    fc.assert(
      fc.property(keysArb, ratiosArb, seedArb, (keys, ratios, seed) => {
        const assignment = splitAssign(keys, { ratios, seed });
        for (const members of strata(keys).values()) {
          const inStratum = new Set(members);
          for (const part of ['train', 'dev', 'test'] as const) {
            const count = assignment[part].filter((i) => inStratum.has(i)).length;
            expect(Math.abs(count - ratios[part] * members.length)).toBeLessThan(1);
            if (ratios[part] === 0) expect(count).toBe(0);
          }
        }
      }),
      { seed: 43, numRuns: 300 },
    );
  });

  it('gives the same split for the same seed (property)', () => {
    fc.assert(
      fc.property(keysArb, ratiosArb, seedArb, (keys, ratios, seed) => {
        expect(splitAssign(keys, { ratios, seed })).toEqual(splitAssign([...keys], { ratios: { ...ratios }, seed }));
      }),
      { seed: 44, numRuns: 200 },
    );
  });

  it('gives different splits for different seeds on a corpus of 100 (property)', () => {
    // 100 utterances over five intents and none, 0.8/0.1/0.1: two seeds agreeing by chance is
    // about as likely as two shuffles of each stratum cutting the same way, far below 1e-10.
    const keys = Array.from({ length: 100 }, (_, i) => (i % 6 === 5 ? undefined : INTENTS[i % 6]));
    const ratios = { train: 0.8, dev: 0.1, test: 0.1 };
    fc.assert(
      fc.property(seedArb, seedArb, (a, b) => {
        fc.pre(a !== b);
        expect(splitAssign(keys, { ratios, seed: a })).not.toEqual(splitAssign(keys, { ratios, seed: b }));
      }),
      { seed: 45, numRuns: 200 },
    );
  });

  it('splits a single-intent corpus of 10 as 8/1/1 and 0.7/0.15/0.15 of 20 as 14/3/3', () => {
    const ten = splitAssign(Array<string>(10).fill('cancel'), { ratios: { train: 0.8, dev: 0.1, test: 0.1 }, seed: 7 });
    expect([ten.train.length, ten.dev.length, ten.test.length]).toEqual([8, 1, 1]);
    const twenty = splitAssign(Array<string>(20).fill('cancel'), { ratios: { train: 0.7, dev: 0.15, test: 0.15 }, seed: 7 });
    expect([twenty.train.length, twenty.dev.length, twenty.test.length]).toEqual([14, 3, 3]);
  });

  it('refuses bad ratios and seeds with a message', () => {
    const ok = { train: 0.8, dev: 0.1, test: 0.1 };
    expect(splitOptionsProblem({ ratios: ok, seed: 1 })).toBeNull();
    expect(splitOptionsProblem({ ratios: { train: 0.8, dev: 0.1, test: 0.1 + 5e-10 }, seed: 1 })).toBeNull();
    expect(splitOptionsProblem({ ratios: { train: 0.8, dev: 0.1, test: 0.1 + 2e-9 }, seed: 1 })).toMatch(/add up to 1/);
    expect(splitOptionsProblem({ ratios: { train: 1.2, dev: -0.2, test: 0 }, seed: 1 })).toMatch(/dev ratio/);
    expect(splitOptionsProblem({ ratios: { train: Number.NaN, dev: 0.5, test: 0.5 }, seed: 1 })).toMatch(/train ratio/);
    expect(splitOptionsProblem({ ratios: ok, seed: 1.5 })).toMatch(/seed/);
    expect(() => splitAssign(['cancel'], { ratios: { train: 0.5, dev: 0.5, test: 0.5 }, seed: 1 })).toThrow(RangeError);
  });
});

describe('splitCounts (largest remainder)', () => {
  it('hands out exactly the stratum size, each count within 1 of its quota (property)', () => {
    fc.assert(
      fc.property(fc.nat(10_000), ratiosArb, seedArb, (size, ratios, seed) => {
        const counts = splitCounts(size, ratios, randomMulberry32(seed));
        expect(counts.train + counts.dev + counts.test).toBe(size);
        for (const part of ['train', 'dev', 'test'] as const) {
          expect(Math.abs(counts[part] - ratios[part] * size)).toBeLessThan(1);
        }
      }),
      { seed: 46, numRuns: 500 },
    );
  });

  it('gives the leftover seat to the largest remainder: 7 at 0.5/0.3/0.2 is 3.5/2.1/1.4 → 4/2/1', () => {
    // Hamilton's method by hand: floors 3/2/1 leave one seat; the largest remainder (0.5) is train's.
    expect(splitCounts(7, { train: 0.5, dev: 0.3, test: 0.2 }, randomMulberry32(1))).toEqual({ train: 4, dev: 2, test: 1 });
  });

  it('breaks ties with the generator, so small strata do not always favour dev', () => {
    // 5 at 0.8/0.1/0.1: 4 train, and one seat that dev and test tie for (0.5 each).
    const devWins = Array.from({ length: 200 }, (_, seed) => splitCounts(5, { train: 0.8, dev: 0.1, test: 0.1 }, randomMulberry32(seed)).dev);
    const share = devWins.reduce((a, b) => a + b, 0) / devWins.length;
    expect(share).toBeGreaterThan(0.35);
    expect(share).toBeLessThan(0.65);
  });
});

describe('randomMulberry32', () => {
  it('is deterministic per seed and roughly uniform on [0, 1)', () => {
    const a = randomMulberry32(2024);
    const b = randomMulberry32(2024);
    const draws = Array.from({ length: 10_000 }, () => a());
    expect(Array.from({ length: 10_000 }, () => b())).toEqual(draws);
    expect(draws.every((x) => x >= 0 && x < 1)).toBe(true);
    // Mean of 10k uniform draws: standard error 0.29 / 100, so ±0.015 is about five of them.
    const mean = draws.reduce((s, x) => s + x, 0) / draws.length;
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.015);
  });
});
