/** Forward–backward and Viterbi against enumeration of every tag sequence on tiny random lattices. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { iob2TransitionMask, Lattice, ViterbiDecoder } from '../../../src/core/crf';
import { tagParse } from '../../../src/core/schemes';

const LABELS = ['O', 'B-a', 'I-a', 'B-b', 'I-b'];
const L = LABELS.length;

const instance = fc.integer({ min: 1, max: 4 }).chain((tokens) =>
  fc.record({
    tokens: fc.constant(tokens),
    state: fc.array(fc.double({ min: -4, max: 4, noNaN: true }), { minLength: tokens * L, maxLength: tokens * L }),
    trans: fc.array(fc.double({ min: -4, max: 4, noNaN: true }), { minLength: L * L, maxLength: L * L }),
  }),
);

interface Enumerated {
  logZ: number;
  marginals: Float64Array;
  best: number[];
  bestScore: number;
}

/** Every one of Lᵀ paths, scored directly; `legal` keeps only paths the mask allows. */
function enumerate(tokens: number, state: number[], trans: number[], legal: boolean): Enumerated {
  const mask = iob2TransitionMask(LABELS);
  const scores: number[] = [];
  const paths: number[][] = [];
  const total = L ** tokens;
  for (let code = 0; code < total; code++) {
    const path: number[] = [];
    for (let t = 0, c = code; t < tokens; t++, c = Math.floor(c / L)) path.push(c % L);
    let ok = !legal || mask.start[path[0] as number] === 1;
    let score = state[path[0] as number] as number;
    for (let t = 1; t < tokens; t++) {
      const i = path[t - 1] as number;
      const j = path[t] as number;
      if (legal && mask.pair[i * L + j] === 0) ok = false;
      score += (trans[i * L + j] as number) + (state[t * L + j] as number);
    }
    if (!ok) continue;
    paths.push(path);
    scores.push(score);
  }
  const max = Math.max(...scores);
  const z = scores.reduce((s, v) => s + Math.exp(v - max), 0);
  const marginals = new Float64Array(tokens * L);
  paths.forEach((path, k) => {
    const p = Math.exp((scores[k] as number) - max) / z;
    path.forEach((y, t) => (marginals[t * L + y] = (marginals[t * L + y] as number) + p));
  });
  const bestIndex = scores.indexOf(max);
  return { logZ: max + Math.log(z), marginals, best: paths[bestIndex] as number[], bestScore: max };
}

function legalIob2(tags: string[]): boolean {
  return tags.every((tag, t) => {
    const parsed = tagParse(tag);
    if (parsed?.prefix !== 'I') return true;
    const before = t === 0 ? null : tagParse(tags[t - 1] as string);
    return before !== null && before.prefix !== 'O' && before.slot === parsed.slot;
  });
}

describe('forward–backward equals enumeration', () => {
  it('log Z and token marginals, unconstrained and IOB2-constrained', () => {
    const mask = iob2TransitionMask(LABELS);
    fc.assert(
      fc.property(instance, fc.boolean(), ({ tokens, state, trans }, constrained) => {
        const want = enumerate(tokens, state, trans, constrained);
        const expTrans = Float64Array.from(trans, (w, c) => Math.exp(w) * (constrained ? (mask.pair[c] as number) : 1));
        const lattice = new Lattice(L);
        const logZ = lattice.run(tokens, Float64Array.from(state), expTrans, constrained ? mask.start : null);
        expect(logZ).toBeCloseTo(want.logZ, 9);
        want.marginals.forEach((p, i) => expect(lattice.marginals[i]).toBeCloseTo(p, 9));
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('expected transition counts equal the enumerated pair marginals summed over positions', () => {
    fc.assert(
      fc.property(instance, ({ tokens, state, trans }) => {
        const lattice = new Lattice(L);
        const pairs = new Float64Array(L * L);
        const logZ = lattice.run(tokens, Float64Array.from(state), Float64Array.from(trans, Math.exp), null, pairs);
        // Brute force: Σ over paths of p(path) · (number of i→j moves in it).
        const want = new Float64Array(L * L);
        for (let code = 0; code < L ** tokens; code++) {
          const path: number[] = [];
          for (let t = 0, c = code; t < tokens; t++, c = Math.floor(c / L)) path.push(c % L);
          let score = state[path[0] as number] as number;
          for (let t = 1; t < tokens; t++) score += (trans[(path[t - 1] as number) * L + (path[t] as number)] as number) + (state[t * L + (path[t] as number)] as number);
          const p = Math.exp(score - logZ);
          for (let t = 1; t < tokens; t++) {
            const cell = (path[t - 1] as number) * L + (path[t] as number);
            want[cell] = (want[cell] as number) + p;
          }
        }
        want.forEach((v, c) => expect(pairs[c]).toBeCloseTo(v, 9));
      }),
      { seed: 42, numRuns: 150 },
    );
  });
});

describe('constrained Viterbi', () => {
  it('finds the best legal path found by enumeration', () => {
    const mask = iob2TransitionMask(LABELS);
    fc.assert(
      fc.property(instance, ({ tokens, state, trans }) => {
        const want = enumerate(tokens, state, trans, true);
        const path = new Int32Array(tokens);
        const score = new ViterbiDecoder(L).decode(tokens, Float64Array.from(state), Float64Array.from(trans), mask.start, mask.pair, path);
        expect(score).toBeCloseTo(want.bestScore, 9);
        // The back pointers are recomputed along the path only: the path returned must score what was returned.
        let own = state[path[0] as number] as number;
        for (let t = 1; t < tokens; t++) own += (trans[(path[t - 1] as number) * L + (path[t] as number)] as number) + (state[t * L + (path[t] as number)] as number);
        expect(own).toBeCloseTo(score, 9);
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('never emits an illegal IOB2 transition, whatever the scores', () => {
    const mask = iob2TransitionMask(LABELS);
    const long = fc.integer({ min: 1, max: 30 }).chain((tokens) =>
      fc.record({
        tokens: fc.constant(tokens),
        state: fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: tokens * L, maxLength: tokens * L }),
        trans: fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: L * L, maxLength: L * L }),
      }),
    );
    fc.assert(
      fc.property(long, ({ tokens, state, trans }) => {
        const path = new Int32Array(tokens);
        new ViterbiDecoder(L).decode(tokens, Float64Array.from(state), Float64Array.from(trans), mask.start, mask.pair, path);
        expect(legalIob2(Array.from(path, (y) => LABELS[y] as string))).toBe(true);
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});
