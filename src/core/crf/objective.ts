import { CRF_SPAN } from './attributes';
import { type CrfDataset, unitLabelCounts } from './dataset';
import { Lattice } from './lattice';

// tokenScoresSum and marginalsToUnits below are unrolled over exactly five window places.
if (CRF_SPAN !== 5) throw new Error('objective.ts assumes a window of ±2 (CRF_SPAN = 5)');

export interface CrfStructure {
  labelCount: number;
  featureStarts: Int32Array;
  featureLabels: Uint16Array;
}

/**
 * The training objective: negative conditional log-likelihood plus c2·‖w‖² (CRFsuite's L2 form,
 * train_lbfgs.c in the vendored CRFsuite source), with its gradient. The observed feature counts
 * never change, so they are counted once; each evaluation adds the expected counts from
 * forward–backward and subtracts them. Scores and expectations go through the dataset's units
 * (see CrfDataset): a token's scores are the sum of its units' score rows, and a feature's
 * expectation is the sum, over the units holding its attribute, of the marginals those units saw.
 */
export class CrfObjective {
  readonly size: number;
  private readonly observed: Float64Array;
  private readonly lattice: Lattice;
  private readonly state: Float64Array;
  private readonly expTrans: Float64Array;
  private readonly stateCount: number;
  /** Units × labels: each unit's summed state weights, then the marginals summed over its tokens. */
  private readonly unitScores: Float64Array;
  private readonly unitExpected: Float64Array;

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
    const units = data.unitStarts.length - 1;
    this.unitScores = new Float64Array(units * L);
    this.unitExpected = new Float64Array(units * L);
    this.observed = this.observedCount();
  }

  private observedCount(): Float64Array {
    const { data, structure } = this;
    const L = structure.labelCount;
    const counts = new Float64Array(this.size);
    unitRowsToFeatures(structure.featureStarts, structure.featureLabels, L, data.unitStarts, data.unitAttrs, unitLabelCounts(data, L), counts);
    for (let u = 0; u + 1 < data.tokenStarts.length; u++) {
      const stop = data.tokenStarts[u + 1] as number;
      for (let t = (data.tokenStarts[u] as number) + 1; t < stop; t++) {
        const cell = this.stateCount + (data.labels[t - 1] as number) * L + (data.labels[t] as number);
        counts[cell] = (counts[cell] as number) + 1;
      }
    }
    return counts;
  }

  /** f(w) into the return value, ∇f(w) into `gradient`. */
  evaluate(weights: Float64Array, gradient: Float64Array): number {
    const { data, structure, lattice, state, expTrans, stateCount, unitScores, unitExpected } = this;
    const { featureStarts, featureLabels } = structure;
    const { tokenStarts, tokenUnits } = data;
    const L = structure.labelCount;
    for (let c = 0; c < L * L; c++) expTrans[c] = Math.exp(weights[stateCount + c] as number);
    unitScoresFill(featureStarts, featureLabels, weights, L, data.unitStarts, data.unitAttrs, unitScores);
    unitExpected.fill(0);
    gradient.fill(0);
    let logZSum = 0;
    for (let u = 0; u + 1 < tokenStarts.length; u++) {
      const first = tokenStarts[u] as number;
      const tokens = (tokenStarts[u + 1] as number) - first;
      if (tokens === 0) continue;
      tokenScoresSum(tokenUnits, unitScores, L, first, tokens, state);
      logZSum += lattice.run(tokens, state, expTrans, null, gradient, stateCount);
      marginalsToUnits(tokenUnits, lattice.marginals, L, first, tokens, unitExpected);
    }
    unitRowsToFeatures(featureStarts, featureLabels, L, data.unitStarts, data.unitAttrs, unitExpected, gradient);
    // The gold paths' total score is Σ observed·w, so no per-token pass over the gold labels is needed.
    const observed = this.observed;
    const twoC2 = 2 * this.c2;
    let norm = 0;
    let gold = 0;
    for (let i = 0; i < this.size; i++) {
      const w = weights[i] as number;
      const o = observed[i] as number;
      norm += w * w;
      gold += o * w;
      gradient[i] = (gradient[i] as number) - o + twoC2 * w;
    }
    return logZSum - gold + this.c2 * norm;
  }
}

/** Each unit's row of state scores: Σ over its attributes' features of the weight, at the feature's label. */
export function unitScoresFill(
  featureStarts: Int32Array,
  featureLabels: Uint16Array,
  weights: Float64Array,
  labelCount: number,
  unitStarts: Int32Array,
  unitAttrs: Int32Array,
  out: Float64Array,
): void {
  out.fill(0);
  for (let u = 0; u + 1 < unitStarts.length; u++) {
    const row = u * labelCount;
    const end = unitStarts[u + 1] as number;
    for (let k = unitStarts[u] as number; k < end; k++) {
      const a = unitAttrs[k] as number;
      const stop = featureStarts[a + 1] as number;
      for (let f = featureStarts[a] as number; f < stop; f++) {
        const cell = row + (featureLabels[f] as number);
        out[cell] = (out[cell] as number) + (weights[f] as number);
      }
    }
  }
}

/** The reverse of unitScoresFill: add each unit row's value at a feature's label into that feature. */
function unitRowsToFeatures(
  featureStarts: Int32Array,
  featureLabels: Uint16Array,
  labelCount: number,
  unitStarts: Int32Array,
  unitAttrs: Int32Array,
  rows: Float64Array,
  out: Float64Array,
): void {
  for (let u = 0; u + 1 < unitStarts.length; u++) {
    const row = u * labelCount;
    const end = unitStarts[u + 1] as number;
    for (let k = unitStarts[u] as number; k < end; k++) {
      const a = unitAttrs[k] as number;
      const stop = featureStarts[a + 1] as number;
      for (let f = featureStarts[a] as number; f < stop; f++) {
        out[f] = (out[f] as number) + (rows[row + (featureLabels[f] as number)] as number);
      }
    }
  }
}

/** A sequence's state scores (T × L): per token, the sum of its window units' rows (five places, CRF_SPAN). */
function tokenScoresSum(tokenUnits: Int32Array, unitScores: Float64Array, labelCount: number, firstToken: number, tokenCount: number, out: Float64Array): void {
  for (let t = 0; t < tokenCount; t++) {
    const at = (firstToken + t) * CRF_SPAN;
    const row = t * labelCount;
    const u0 = (tokenUnits[at] as number) * labelCount;
    const u1 = (tokenUnits[at + 1] as number) * labelCount;
    const u2 = (tokenUnits[at + 2] as number) * labelCount;
    const u3 = (tokenUnits[at + 3] as number) * labelCount;
    const u4 = (tokenUnits[at + 4] as number) * labelCount;
    for (let j = 0; j < labelCount; j++) {
      out[row + j] =
        (unitScores[u0 + j] as number) + (unitScores[u1 + j] as number) + (unitScores[u2 + j] as number) + (unitScores[u3 + j] as number) + (unitScores[u4 + j] as number);
    }
  }
}

/** Add each token's marginal row into each of its window units' rows. */
function marginalsToUnits(tokenUnits: Int32Array, marginals: Float64Array, labelCount: number, firstToken: number, tokenCount: number, out: Float64Array): void {
  for (let t = 0; t < tokenCount; t++) {
    const at = (firstToken + t) * CRF_SPAN;
    const row = t * labelCount;
    const u0 = (tokenUnits[at] as number) * labelCount;
    const u1 = (tokenUnits[at + 1] as number) * labelCount;
    const u2 = (tokenUnits[at + 2] as number) * labelCount;
    const u3 = (tokenUnits[at + 3] as number) * labelCount;
    const u4 = (tokenUnits[at + 4] as number) * labelCount;
    for (let j = 0; j < labelCount; j++) {
      const m = marginals[row + j] as number;
      out[u0 + j] = (out[u0 + j] as number) + m;
      out[u1 + j] = (out[u1 + j] as number) + m;
      out[u2 + j] = (out[u2 + j] as number) + m;
      out[u3 + j] = (out[u3 + j] as number) + m;
      out[u4 + j] = (out[u4 + j] as number) + m;
    }
  }
}
