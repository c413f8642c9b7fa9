/**
 * A trained linear-chain CRF (Lafferty, McCallum & Pereira 2001). State features pair an attribute
 * with a label and exist only for pairs seen in training (as CRFsuite does by default); transition
 * features cover every label pair. `weights` holds the F state weights, then the L×L transition
 * weights, row = previous label.
 */
export interface CrfModel {
  labels: string[];
  /** Attribute id → attribute string (see attributes.ts). */
  attributes: string[];
  /** Attribute a owns state features featureStarts[a] .. featureStarts[a + 1] - 1. */
  featureStarts: Int32Array;
  /** Label id of each state feature. */
  featureLabels: Uint16Array;
  weights: Float64Array;
  training: CrfTrainingRecord;
}

export interface CrfTrainingRecord {
  featureSet: string;
  c2: number;
  seed: number;
  maxIterations: number;
  iterations: number;
  loss: number;
  stopped: string;
  utterances: number;
  tokens: number;
  /** Objective evaluations (iterations plus line-search trials). */
  evaluations: number;
}

export function modelStateCount(model: Pick<CrfModel, 'featureLabels'>): number {
  return model.featureLabels.length;
}

/** Each token's state scores into `out` (T × L, zeroed here), attribute by attribute: the plain form, which training's and tagging's per-unit sums are tested against. */
export function stateScoresFill(
  featureStarts: Int32Array,
  featureLabels: Uint16Array,
  weights: Float64Array,
  labelCount: number,
  attrEnds: Int32Array,
  attrIds: Int32Array,
  firstToken: number,
  tokenCount: number,
  out: Float64Array,
): void {
  out.fill(0, 0, tokenCount * labelCount);
  let k = firstToken === 0 ? 0 : (attrEnds[firstToken - 1] as number);
  for (let t = 0; t < tokenCount; t++) {
    const end = attrEnds[firstToken + t] as number;
    const row = t * labelCount;
    for (; k < end; k++) {
      const a = attrIds[k] as number;
      const stop = featureStarts[a + 1] as number;
      for (let f = featureStarts[a] as number; f < stop; f++) {
        const cell = row + (featureLabels[f] as number);
        out[cell] = (out[cell] as number) + (weights[f] as number);
      }
    }
  }
}
