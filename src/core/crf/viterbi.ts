/**
 * Best label path under the transition mask (Viterbi 1967, in log space). Forbidden moves are
 * skipped outright rather than given a large negative score, so no weight can make them win; with
 * an IOB2 mask the path is always legal IOB2. `O` (or any label without constraints) keeps a legal
 * path available at every position. Returns the path score; `path` receives label ids.
 */
export class ViterbiDecoder {
  readonly labelCount: number;
  private delta = new Float64Array(0);
  private transSeen: Float64Array | null = null;
  private pairSeen: Float64Array | null = null;
  /** Label j's allowed predecessors are fromIds[fromStarts[j] .. fromStarts[j + 1] - 1], with their transition weights beside them in fromTrans. */
  private fromStarts: Int32Array;
  private fromIds = new Int32Array(0);
  private fromTrans = new Float64Array(0);

  constructor(labelCount: number) {
    this.labelCount = labelCount;
    this.fromStarts = new Int32Array(labelCount + 1);
  }

  /** Built once per (trans, pair) pair of arrays: callers do not edit them in place between calls. */
  private predecessors(trans: Float64Array, pair: Float64Array | null): void {
    if (trans === this.transSeen && pair === this.pairSeen && this.fromIds.length > 0) return;
    const L = this.labelCount;
    const ids: number[] = [];
    const weights: number[] = [];
    for (let j = 0; j < L; j++) {
      this.fromStarts[j] = ids.length;
      for (let i = 0; i < L; i++) {
        if (pair !== null && pair[i * L + j] === 0) continue;
        ids.push(i);
        weights.push(trans[i * L + j] as number);
      }
    }
    this.fromStarts[L] = ids.length;
    this.fromIds = Int32Array.from(ids);
    this.fromTrans = Float64Array.from(weights);
    this.transSeen = trans;
    this.pairSeen = pair;
  }

  decode(tokens: number, state: Float64Array, trans: Float64Array, start: Float64Array | null, pair: Float64Array | null, path: Int32Array): number {
    const L = this.labelCount;
    if (this.delta.length < tokens * L) this.delta = new Float64Array(tokens * L * 2);
    this.predecessors(trans, pair);
    const { delta, fromStarts, fromIds, fromTrans } = this;
    for (let j = 0; j < L; j++) delta[j] = start === null || start[j] !== 0 ? (state[j] as number) : -Infinity;
    // Forward pass keeps only the best scores; the argmax is recomputed for the one label per position the path takes.
    for (let t = 1; t < tokens; t++) {
      const prev = (t - 1) * L;
      const base = t * L;
      for (let j = 0; j < L; j++) {
        const stop = fromStarts[j + 1] as number;
        let best = -Infinity;
        for (let k = fromStarts[j] as number; k < stop; k++) {
          const v = (delta[prev + (fromIds[k] as number)] as number) + (fromTrans[k] as number);
          if (v > best) best = v;
        }
        delta[base + j] = best + (state[base + j] as number);
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
      const prev = (t - 1) * L;
      const stop = fromStarts[arg + 1] as number;
      let top = -Infinity;
      let from = -1;
      // Same sums in the same order as the forward pass, so the first maximum found is the one it kept.
      for (let k = fromStarts[arg] as number; k < stop; k++) {
        const v = (delta[prev + (fromIds[k] as number)] as number) + (fromTrans[k] as number);
        if (v > top) {
          top = v;
          from = fromIds[k] as number;
        }
      }
      arg = from;
      path[t - 1] = arg;
    }
    return best;
  }
}
