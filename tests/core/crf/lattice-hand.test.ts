/**
 * Forward–backward and Viterbi on a 3-token, 3-tag example invented for this test and worked by
 * hand (not taken from a textbook). Tags: 0 = O, 1 = B-X, 2 = I-X. Scores are logarithms of small
 * integer potentials ψ (state) and φ (transition), so every sum below is integer arithmetic.
 */
import { describe, expect, it } from 'vitest';
import { iob2TransitionMask, Lattice, ViterbiDecoder } from '../../../src/core/crf';

const L = 3;
const log = (values: number[]) => Float64Array.from(values, (v) => Math.log(v));
// φ(i → j) = 1 everywhere except φ(B-X → I-X) = 2. Row = previous tag.
const phi = [1, 1, 1, 1, 1, 2, 1, 1, 1];
const trans = log(phi);
const expTrans = Float64Array.from(phi);

describe('hand-worked example, no constraints', () => {
  // ψ₀ = [1, 2, 1], ψ₁ = [1, 1, 3], ψ₂ = [2, 1, 1]
  const state = log([1, 2, 1, 1, 1, 3, 2, 1, 1]);

  it('forward–backward gives Z = 108 and the marginals worked below', () => {
    // Forward, α₀ = ψ₀ = [1, 2, 1].
    // α₁(O) = ψ₁(O)·(1 + 2 + 1) = 4; α₁(B) = 1·4 = 4; α₁(I) = 3·(1·1 + 2·2 + 1·1) = 3·6 = 18.
    // α₂(O) = 2·(4 + 4 + 18) = 52; α₂(B) = 1·26 = 26; α₂(I) = 1·(4 + 4·2 + 18) = 30.  Z = 52 + 26 + 30 = 108.
    // Backward, β₂ = [1, 1, 1]; ψ₂β₂ = [2, 1, 1].
    // β₁(O) = 2 + 1 + 1 = 4; β₁(B) = 2 + 1 + 2·1 = 5; β₁(I) = 4.   ψ₁β₁ = [4, 5, 12].
    // β₀(O) = 4 + 5 + 12 = 21; β₀(B) = 4 + 5 + 2·12 = 33; β₀(I) = 21.  Check: Σ α₀β₀ = 21 + 66 + 21 = 108.
    // Marginals αβ/Z: p₀ = [21, 66, 21]/108, p₁ = [4·4, 4·5, 18·4]/108 = [16, 20, 72]/108, p₂ = [52, 26, 30]/108.
    const lattice = new Lattice(L);
    const pairs = new Float64Array(L * L);
    const logZ = lattice.run(3, state, expTrans, null, pairs);
    expect(logZ).toBeCloseTo(Math.log(108), 12);
    const expected = [21, 66, 21, 16, 20, 72, 52, 26, 30].map((v) => v / 108);
    expected.forEach((p, i) => expect(lattice.marginals[i]).toBeCloseTo(p, 12));
    // Expected B→I transitions: p(y₀=B, y₁=I) + p(y₁=B, y₂=I) = α₀(B)φ(B,I)ψ₁(I)β₁(I)/Z + α₁(B)φ(B,I)ψ₂(I)β₂(I)/Z
    // = (2·2·3·4 + 4·2·1·1)/108 = (48 + 8)/108 = 56/108.
    expect(pairs[1 * L + 2]).toBeCloseTo(56 / 108, 12);
    // Each position pair's expectations sum to 1, so all pairs sum to 2.
    expect(pairs.reduce((a, b) => a + b, 0)).toBeCloseTo(2, 12);
  });

  it('Viterbi finds B-X I-X O with potential 24', () => {
    // δ₀ = [1, 2, 1].
    // δ₁(O) = 1·max(1, 2, 1) = 2 (from B); δ₁(B) = 2 (from B); δ₁(I) = 3·max(1, 2·2, 1) = 12 (from B).
    // δ₂(O) = 2·max(2, 2, 12) = 24 (from I); δ₂(B) = 12; δ₂(I) = 1·max(2, 2·2, 12) = 12.
    // Best: 24 = ψ₀(B)·φ(B,I)·ψ₁(I)·φ(I,O)·ψ₂(O) = 2·2·3·1·2.
    const path = new Int32Array(3);
    const score = new ViterbiDecoder(L).decode(3, state, trans, null, null, path);
    expect(Array.from(path)).toEqual([1, 2, 0]);
    expect(score).toBeCloseTo(Math.log(24), 12);
  });
});

describe('hand-worked example under the IOB2 constraints', () => {
  // ψ₀ = [1, 1, 4], ψ₁ = [1, 1, 3], ψ₂ = [2, 1, 1]; I-X may not start, and may follow only B-X or I-X.
  const state = log([1, 1, 4, 1, 1, 3, 2, 1, 1]);
  const mask = iob2TransitionMask(['O', 'B-X', 'I-X']);

  it('builds the IOB2 mask by hand', () => {
    expect(Array.from(mask.start)).toEqual([1, 1, 0]);
    // Row = previous: O→I forbidden; B→I and I→I allowed; everything may go to O or B.
    expect(Array.from(mask.pair)).toEqual([1, 1, 0, 1, 1, 1, 1, 1, 1]);
  });

  it('unconstrained Viterbi would start with I-X; constrained gives B-X I-X O', () => {
    // Unconstrained: δ₀ = [1, 1, 4]; δ₁(I) = 3·max(1, 1·2, 4) = 12 (from I); δ₂(O) = 2·12 = 24 → I I O (illegal).
    const free = new Int32Array(3);
    new ViterbiDecoder(L).decode(3, state, trans, null, null, free);
    expect(Array.from(free)).toEqual([2, 2, 0]);
    // Constrained: δ₀ = [1, 1, —]; δ₁(O) = max(1, 1) = 1; δ₁(B) = 1; δ₁(I) = 3·(δ₀(B)·2) = 6 (from B).
    // δ₂(O) = 2·max(1, 1, 6) = 12 (from I); δ₂(B) = 6; δ₂(I) = max(1·2, 6·1) = 6.  Best 12: B-X I-X O.
    const path = new Int32Array(3);
    const score = new ViterbiDecoder(L).decode(3, state, trans, mask.start, mask.pair, path);
    expect(Array.from(path)).toEqual([1, 2, 0]);
    expect(score).toBeCloseTo(Math.log(12), 12);
  });

  it('constrained forward gives Z = 40, so P(best) = 12/40 and least confidence 0.7', () => {
    // α₀ = [1, 1, 0]; α₁(O) = 1·(1 + 1) = 2; α₁(B) = 2; α₁(I) = 3·(α₀(B)·2) = 6.
    // α₂(O) = 2·(2 + 2 + 6) = 20; α₂(B) = 10; α₂(I) = α₁(B)·2 + α₁(I)·1 = 4 + 6 = 10.  Z = 40.
    // Backward: β₁ = [ψ₂(O) + ψ₂(B), 2 + 1 + 2·1, 2 + 1 + 1] = [3, 5, 4] (O→I forbidden).
    // p₁ = α₁β₁/Z = [2·3, 2·5, 6·4]/40 = [6, 10, 24]/40; p₂ = α₂/Z = [20, 10, 10]/40.
    // β₀(i) = Σ_j φ(i,j)·ψ₁(j)·β₁(j) with ψ₁β₁ = [3, 5, 12]: β₀(O) = 3 + 5 = 8, β₀(B) = 3 + 5 + 2·12 = 32, β₀(I) = 20.
    // p₀ = α₀β₀/Z = [8, 32, 0]/40 (check: 8 + 32 = 40).
    const expConstrained = Float64Array.from(phi, (v, c) => v * (mask.pair[c] as number));
    const lattice = new Lattice(L);
    const logZ = lattice.run(3, state, expConstrained, mask.start);
    expect(logZ).toBeCloseTo(Math.log(40), 12);
    const expected = [8, 32, 0, 6, 10, 24, 20, 10, 10].map((v) => v / 40);
    expected.forEach((p, i) => expect(lattice.marginals[i]).toBeCloseTo(p, 12));
    expect(Math.exp(Math.log(12) - logZ)).toBeCloseTo(0.3, 12);
  });
});
