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
  private maskSeen: Float64Array | null = null;
  /** Allowed predecessors of each label, so the inner loop does no mask tests; built once per mask array (masks are not edited in place). */
  private from: Int32Array[] = [];

  private predecessors(pair: Float64Array | null): Int32Array[] {
    if (pair !== this.maskSeen || this.from.length === 0) {
      const L = this.labelCount;
      this.from = Array.from({ length: L }, (_, j) => Int32Array.from({ length: L }, (_, i) => i).filter((i) => pair === null || pair[i * L + j] !== 0));
      this.maskSeen = pair;
    }
    return this.from;
  }

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
    const from = this.predecessors(pair);
    for (let j = 0; j < L; j++) delta[j] = start === null || start[j] !== 0 ? (state[j] as number) : -Infinity;
    for (let t = 1; t < tokens; t++) {
      const prev = (t - 1) * L;
      const base = t * L;
      for (let j = 0; j < L; j++) {
        const allowed = from[j] as Int32Array;
        let best = -Infinity;
        let arg = -1;
        for (let k = 0; k < allowed.length; k++) {
          const i = allowed[k] as number;
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
