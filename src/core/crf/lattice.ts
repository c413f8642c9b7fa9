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
  /** Token marginals, T × L, after `run`. */
  marginals = new Float64Array(0);
  private readonly row: Float64Array;
  private readonly pairs: Float64Array;
  /** expTrans transposed, so the forward sum over predecessors reads memory in order. */
  private readonly transposed: Float64Array;

  constructor(labelCount: number) {
    this.labelCount = labelCount;
    this.row = new Float64Array(labelCount);
    this.pairs = new Float64Array(labelCount * labelCount);
    this.transposed = new Float64Array(labelCount * labelCount);
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
    const { expState } = this;
    let shift = 0;
    for (let t = 0; t < tokens; t++) {
      const base = t * L;
      let max = state[base] as number;
      for (let j = 1; j < L; j++) {
        const v = state[base + j] as number;
        if (v > max) max = v;
      }
      shift += max;
      for (let j = 0; j < L; j++) expState[base + j] = Math.exp((state[base + j] as number) - max);
    }
    this.transitionsSet(expTrans);
    const pairs = pairOut === null ? null : this.pairs;
    if (pairs !== null) pairs.fill(0);
    const logZ = shift + this.runScaled(tokens, expTrans, start, pairs);
    if (pairOut !== null && pairs !== null) {
      for (let k = 0; k < L * L; k++) pairOut[pairOffset + k] = (pairOut[pairOffset + k] as number) + (pairs[k] as number) * (expTrans[k] as number);
    }
    return logZ;
  }

  /** Keep expTrans transposed for `runScaled`: once per set of transition weights, not per sequence. */
  transitionsSet(expTrans: Float64Array): void {
    const L = this.labelCount;
    const transposed = this.transposed;
    for (let i = 0; i < L; i++) for (let j = 0; j < L; j++) transposed[j * L + i] = expTrans[i * L + j] as number;
  }

  /**
   * Forward–backward on `expState` as the caller filled it (T × L, exp of the state scores less a
   * shift the caller adds to log Z), with `transitionsSet(expTrans)` done. Fills `marginals`; when
   * `pairSums` is given, adds Σ_t α̂_t(i) Ŝ_{t+1}(j) β̂_{t+1}(j) into it: times E(i, j), the expected
   * transition counts, a product a caller may take once over many sequences. Returns log Z less the shift.
   */
  runScaled(tokens: number, expTrans: Float64Array, start: Float64Array | null, pairSums: Float64Array | null): number {
    const L = this.labelCount;
    const { expState, alpha, beta, scale, marginals, row, transposed } = this;
    let logZ = 0;
    // Forward.
    let sum = 0;
    for (let j = 0; j < L; j++) {
      const v = start === null ? (expState[j] as number) : (expState[j] as number) * (start[j] as number);
      alpha[j] = v;
      sum += v;
    }
    let c = 1 / sum;
    scale[0] = c;
    for (let j = 0; j < L; j++) alpha[j] = (alpha[j] as number) * c;
    for (let t = 1; t < tokens; t++) {
      const prev = (t - 1) * L;
      const base = t * L;
      sum = 0;
      for (let j = 0; j < L; j++) {
        const tr = j * L;
        // Two running sums halve the add-latency chain that bounds this loop.
        let s0 = 0;
        let s1 = 0;
        let i = 0;
        for (; i + 1 < L; i += 2) {
          s0 += (alpha[prev + i] as number) * (transposed[tr + i] as number);
          s1 += (alpha[prev + i + 1] as number) * (transposed[tr + i + 1] as number);
        }
        if (i < L) s0 += (alpha[prev + i] as number) * (transposed[tr + i] as number);
        const s = (s0 + s1) * (expState[base + j] as number);
        alpha[base + j] = s;
        sum += s;
      }
      c = 1 / sum;
      scale[t] = c;
      for (let j = 0; j < L; j++) alpha[base + j] = (alpha[base + j] as number) * c;
    }
    // Backward, scaled by the same factors; the pair expectations share its loop over (i, j).
    const pairs = pairSums;
    const last = (tokens - 1) * L;
    c = scale[tokens - 1] as number;
    for (let i = 0; i < L; i++) beta[last + i] = c;
    for (let t = tokens - 2; t >= 0; t--) {
      const base = t * L;
      const next = base + L;
      for (let j = 0; j < L; j++) row[j] = (expState[next + j] as number) * (beta[next + j] as number);
      c = scale[t] as number;
      if (pairs === null) {
        for (let i = 0; i < L; i++) {
          const tr = i * L;
          let s0 = 0;
          let s1 = 0;
          let j = 0;
          for (; j + 1 < L; j += 2) {
            s0 += (expTrans[tr + j] as number) * (row[j] as number);
            s1 += (expTrans[tr + j + 1] as number) * (row[j + 1] as number);
          }
          if (j < L) s0 += (expTrans[tr + j] as number) * (row[j] as number);
          beta[base + i] = (s0 + s1) * c;
        }
      } else {
        for (let i = 0; i < L; i++) {
          const tr = i * L;
          const a = alpha[base + i] as number;
          let s0 = 0;
          let s1 = 0;
          let j = 0;
          for (; j + 1 < L; j += 2) {
            const r0 = row[j] as number;
            const r1 = row[j + 1] as number;
            s0 += (expTrans[tr + j] as number) * r0;
            s1 += (expTrans[tr + j + 1] as number) * r1;
            pairs[tr + j] = (pairs[tr + j] as number) + a * r0;
            pairs[tr + j + 1] = (pairs[tr + j + 1] as number) + a * r1;
          }
          if (j < L) {
            const r0 = row[j] as number;
            s0 += (expTrans[tr + j] as number) * r0;
            pairs[tr + j] = (pairs[tr + j] as number) + a * r0;
          }
          beta[base + i] = (s0 + s1) * c;
        }
      }
    }
    // Marginals p_t(i) = α̂_t(i) β̂_t(i) / c_t; pairs p(i, j) = α̂_t(i) E(i, j) Ŝ_{t+1}(j) β̂_{t+1}(j), with E(i, j) taken out of the sum over t.
    for (let t = 0; t < tokens; t++) {
      const base = t * L;
      const s = scale[t] as number;
      logZ -= Math.log(s);
      const inverse = 1 / s;
      for (let i = 0; i < L; i++) marginals[base + i] = (alpha[base + i] as number) * (beta[base + i] as number) * inverse;
    }
    return logZ;
  }
}
