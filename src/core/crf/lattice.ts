/**
 * Forward–backward over one sequence's lattice, scaled rather than in log space (Rabiner 1989's
 * scaling, as CRFsuite's crf1d_context does): each column of α is normalised to sum 1 and the
 * scales recover log Z, so the inner loops are multiply–adds with no exp or log. Each position's
 * state scores are shifted by their maximum before exp, which keeps large weights from overflowing.
 */
export class Lattice {
  readonly labelCount: number;
  private capacity = 0;
  expState = new Float64Array(0);
  alpha = new Float64Array(0);
  beta = new Float64Array(0);
  scale = new Float64Array(0);
  shift = new Float64Array(0);
  /** Token marginals, T × L, after `run`. */
  marginals = new Float64Array(0);
  private readonly row: Float64Array;
  private readonly pairs: Float64Array;

  constructor(labelCount: number) {
    this.labelCount = labelCount;
    this.row = new Float64Array(labelCount);
    this.pairs = new Float64Array(labelCount * labelCount);
  }

  reserve(tokens: number): void {
    if (tokens <= this.capacity) return;
    const size = Math.max(tokens, this.capacity * 2);
    const cells = size * this.labelCount;
    this.expState = new Float64Array(cells);
    this.alpha = new Float64Array(cells);
    this.beta = new Float64Array(cells);
    this.marginals = new Float64Array(cells);
    this.scale = new Float64Array(size);
    this.shift = new Float64Array(size);
    this.capacity = size;
  }

  /**
   * Run forward–backward on `state` (T × L log scores) with `expTrans` (L × L, exp of the
   * transition weights, 0 where forbidden) and `start` (per label 1 allowed / 0 forbidden, or null).
   * Fills `marginals`; when `pairOut` is given, adds the expected transition counts into
   * pairOut[pairOffset + i * L + j]. Returns log Z.
   */
  run(
    tokens: number,
    state: Float64Array,
    expTrans: Float64Array,
    start: Float64Array | null,
    pairOut: Float64Array | null = null,
    pairOffset = 0,
  ): number {
    const L = this.labelCount;
    this.reserve(tokens);
    const { expState, alpha, beta, scale, shift, marginals, row } = this;
    for (let t = 0; t < tokens; t++) {
      const base = t * L;
      let max = -Infinity;
      for (let j = 0; j < L; j++) if ((state[base + j] as number) > max) max = state[base + j] as number;
      shift[t] = max;
      for (let j = 0; j < L; j++) expState[base + j] = Math.exp((state[base + j] as number) - max);
    }
    // Forward.
    let sum = 0;
    for (let j = 0; j < L; j++) {
      const v = (expState[j] as number) * (start === null ? 1 : (start[j] as number));
      alpha[j] = v;
      sum += v;
    }
    scale[0] = 1 / sum;
    for (let j = 0; j < L; j++) alpha[j] = (alpha[j] as number) / sum;
    for (let t = 1; t < tokens; t++) {
      const prev = (t - 1) * L;
      const base = t * L;
      row.fill(0);
      for (let i = 0; i < L; i++) {
        const a = alpha[prev + i] as number;
        if (a === 0) continue;
        const tr = i * L;
        for (let j = 0; j < L; j++) row[j] = (row[j] as number) + a * (expTrans[tr + j] as number);
      }
      sum = 0;
      for (let j = 0; j < L; j++) {
        const v = (row[j] as number) * (expState[base + j] as number);
        alpha[base + j] = v;
        sum += v;
      }
      const c = 1 / sum;
      scale[t] = c;
      for (let j = 0; j < L; j++) alpha[base + j] = (alpha[base + j] as number) * c;
    }
    // Backward, scaled by the same factors; the pair expectations share its inner loop.
    const pairs = pairOut === null ? null : this.pairs;
    if (pairs !== null) pairs.fill(0);
    const last = (tokens - 1) * L;
    for (let i = 0; i < L; i++) beta[last + i] = scale[tokens - 1] as number;
    for (let t = tokens - 2; t >= 0; t--) {
      const base = t * L;
      const next = (t + 1) * L;
      for (let j = 0; j < L; j++) row[j] = (expState[next + j] as number) * (beta[next + j] as number);
      const c = scale[t] as number;
      for (let i = 0; i < L; i++) {
        const tr = i * L;
        let s = 0;
        if (pairs === null) {
          for (let j = 0; j < L; j++) s += (expTrans[tr + j] as number) * (row[j] as number);
        } else {
          const a = alpha[base + i] as number;
          for (let j = 0; j < L; j++) {
            const r = row[j] as number;
            s += (expTrans[tr + j] as number) * r;
            pairs[tr + j] = (pairs[tr + j] as number) + a * r;
          }
        }
        beta[base + i] = s * c;
      }
    }
    // Marginals p_t(i) = α̂_t(i) β̂_t(i) / c_t; pairs p(i, j) = α̂_t(i) E(i, j) Ŝ_{t+1}(j) β̂_{t+1}(j), with E(i, j) taken out of the sum over t.
    let logZ = 0;
    for (let t = 0; t < tokens; t++) {
      const base = t * L;
      const c = scale[t] as number;
      logZ += (shift[t] as number) - Math.log(c);
      for (let i = 0; i < L; i++) marginals[base + i] = ((alpha[base + i] as number) * (beta[base + i] as number)) / c;
    }
    if (pairOut !== null && pairs !== null) {
      for (let c = 0; c < L * L; c++) pairOut[pairOffset + c] = (pairOut[pairOffset + c] as number) + (pairs[c] as number) * (expTrans[c] as number);
    }
    return logZ;
  }
}
