import type { CrfDataset } from './dataset';
import { Lattice } from './lattice';
import { stateScoresFill } from './model';

export interface CrfStructure {
  labelCount: number;
  featureStarts: Int32Array;
  featureLabels: Uint16Array;
}

/**
 * The training objective: negative conditional log-likelihood plus c2·‖w‖² (CRFsuite's L2 form,
 * train_lbfgs.c in the vendored CRFsuite source), with its gradient. The observed feature counts
 * never change, so they are counted once; each evaluation adds the expected counts from
 * forward–backward and subtracts them.
 */
export class CrfObjective {
  readonly size: number;
  private readonly observed: Float64Array;
  private readonly lattice: Lattice;
  private readonly state: Float64Array;
  private readonly expTrans: Float64Array;
  private readonly stateCount: number;

  constructor(
    private readonly data: CrfDataset,
    private readonly structure: CrfStructure,
    private readonly c2: number,
  ) {
    const L = structure.labelCount;
    this.stateCount = structure.featureLabels.length;
    this.size = this.stateCount + L * L;
    this.lattice = new Lattice(L);
    let longest = 1;
    for (let u = 0; u + 1 < data.tokenStarts.length; u++) {
      longest = Math.max(longest, (data.tokenStarts[u + 1] as number) - (data.tokenStarts[u] as number));
    }
    this.lattice.reserve(longest);
    this.state = new Float64Array(longest * L);
    this.expTrans = new Float64Array(L * L);
    this.observed = this.observedCount();
  }

  private observedCount(): Float64Array {
    const { data, structure } = this;
    const L = structure.labelCount;
    const counts = new Float64Array(this.size);
    let k = 0;
    for (let u = 0; u + 1 < data.tokenStarts.length; u++) {
      const first = data.tokenStarts[u] as number;
      const stop = data.tokenStarts[u + 1] as number;
      for (let t = first; t < stop; t++) {
        const y = data.labels[t] as number;
        const end = data.attrEnds[t] as number;
        for (; k < end; k++) {
          const a = data.attrIds[k] as number;
          const last = structure.featureStarts[a + 1] as number;
          for (let f = structure.featureStarts[a] as number; f < last; f++) {
            if (structure.featureLabels[f] === y) counts[f] = (counts[f] as number) + 1;
          }
        }
        if (t > first) {
          const cell = this.stateCount + (data.labels[t - 1] as number) * L + y;
          counts[cell] = (counts[cell] as number) + 1;
        }
      }
    }
    return counts;
  }

  /** f(w) into the return value, ∇f(w) into `gradient`. */
  evaluate(weights: Float64Array, gradient: Float64Array): number {
    const { data, structure, lattice, state, expTrans, stateCount } = this;
    const L = structure.labelCount;
    for (let c = 0; c < L * L; c++) expTrans[c] = Math.exp(weights[stateCount + c] as number);
    gradient.fill(0);
    let loss = 0;
    for (let u = 0; u + 1 < data.tokenStarts.length; u++) {
      const first = data.tokenStarts[u] as number;
      const tokens = (data.tokenStarts[u + 1] as number) - first;
      if (tokens === 0) continue;
      stateScoresFill(structure.featureStarts, structure.featureLabels, weights, L, data.attrEnds, data.attrIds, first, tokens, state);
      let gold = 0;
      for (let t = 0; t < tokens; t++) {
        const y = data.labels[first + t] as number;
        gold += state[t * L + y] as number;
        if (t > 0) gold += weights[stateCount + (data.labels[first + t - 1] as number) * L + y] as number;
      }
      const logZ = lattice.run(tokens, state, expTrans, null, gradient, stateCount);
      loss += logZ - gold;
      const marginals = lattice.marginals;
      let k = first === 0 ? 0 : (data.attrEnds[first - 1] as number);
      for (let t = 0; t < tokens; t++) {
        const end = data.attrEnds[first + t] as number;
        const row = t * L;
        for (; k < end; k++) {
          const a = data.attrIds[k] as number;
          const last = structure.featureStarts[a + 1] as number;
          for (let f = structure.featureStarts[a] as number; f < last; f++) {
            gradient[f] = (gradient[f] as number) + (marginals[row + (structure.featureLabels[f] as number)] as number);
          }
        }
      }
    }
    const observed = this.observed;
    const twoC2 = 2 * this.c2;
    let norm = 0;
    for (let i = 0; i < this.size; i++) {
      const w = weights[i] as number;
      norm += w * w;
      gradient[i] = (gradient[i] as number) - (observed[i] as number) + twoC2 * w;
    }
    return loss + this.c2 * norm;
  }
}
