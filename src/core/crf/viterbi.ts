/**
 * Best label path under the transition mask (Viterbi 1967, in log space). Forbidden moves are
 * skipped outright rather than given a large negative score, so no weight can make them win; with
 * an IOB2 mask the path is always legal IOB2. `O` (or any label without constraints) keeps a legal
 * path available at every position. Returns the path score; `path` receives label ids.
 */
export class ViterbiDecoder {
  readonly labelCount: number;
  private delta = new Float64Array(0);
  private back = new Int32Array(0);

  constructor(labelCount: number) {
    this.labelCount = labelCount;
  }

  decode(tokens: number, state: Float64Array, trans: Float64Array, start: Float64Array | null, pair: Float64Array | null, path: Int32Array): number {
    const L = this.labelCount;
    if (this.delta.length < tokens * L) {
      this.delta = new Float64Array(tokens * L * 2);
      this.back = new Int32Array(tokens * L * 2);
    }
    const { delta, back } = this;
    for (let j = 0; j < L; j++) delta[j] = start === null || start[j] !== 0 ? (state[j] as number) : -Infinity;
    for (let t = 1; t < tokens; t++) {
      const prev = (t - 1) * L;
      const base = t * L;
      for (let j = 0; j < L; j++) {
        let best = -Infinity;
        let arg = -1;
        for (let i = 0; i < L; i++) {
          if (pair !== null && pair[i * L + j] === 0) continue;
          const v = (delta[prev + i] as number) + (trans[i * L + j] as number);
          if (v > best) {
            best = v;
            arg = i;
          }
        }
        delta[base + j] = best + (state[base + j] as number);
        back[base + j] = arg;
      }
    }
    const last = (tokens - 1) * L;
    let best = -Infinity;
    let arg = 0;
    for (let j = 0; j < L; j++) {
      if ((delta[last + j] as number) > best) {
        best = delta[last + j] as number;
        arg = j;
      }
    }
    path[tokens - 1] = arg;
    for (let t = tokens - 1; t > 0; t--) {
      arg = back[t * L + arg] as number;
      path[t - 1] = arg;
    }
    return best;
  }
}
