import { CRF_SPAN, CRF_WINDOW } from './attributes';
import type { CrfSequence } from './dataset';
import { AttributeEncoder } from './encoder';
import { iob2TransitionMask, type TransitionMask } from './labels';
import { Lattice } from './lattice';
import type { CrfModel } from './model';
import { ViterbiDecoder } from './viterbi';

export interface CrfTagging {
  tags: string[];
  /** Per token: the marginal probability of the chosen label (forward–backward, IOB2-constrained). */
  confidence: Float64Array;
  /** P(best path | words) under the constrained model. */
  pathProbability: number;
  /** 1 − P(best path): the least-confidence score for active learning (Settles & Craven 2008). */
  leastConfidence: number;
}

export interface CrfTagger {
  readonly labels: readonly string[];
  /** Tags only (Viterbi), the fast path for bulk tagging. */
  tags(words: readonly string[]): string[];
  /** Tags plus confidence figures. */
  tag(words: readonly string[]): CrfTagging;
  /** Token marginals, T × L row-major (IOB2-constrained). */
  marginals(words: readonly string[]): Float64Array;
}

/** Doubles the per-word score cache may hold (32 MiB) before it starts over. */
const WORD_SCORES_BUDGET = 1 << 22;

/** Σ of the model's state weights over `ids`, per label, into out[offset .. offset + L - 1]. */
function idsScoresAdd(model: CrfModel, ids: Int32Array, out: Float64Array, offset: number): void {
  for (const a of ids) {
    const stop = model.featureStarts[a + 1] as number;
    for (let f = model.featureStarts[a] as number; f < stop; f++) {
      const cell = offset + (model.featureLabels[f] as number);
      out[cell] = (out[cell] as number) + (model.weights[f] as number);
    }
  }
}

/**
 * A tagger over a model: encodes words, decodes under the IOB2 mask, never emits an illegal
 * transition. The weights are fixed, so each distinct word's score rows (one per window place, as
 * in training's units) are summed once and cached; a token's scores are then CRF_SPAN row sums.
 */
export function crfTagger(model: CrfModel): CrfTagger {
  const L = model.labels.length;
  const stateCount = model.featureLabels.length;
  const encoder = new AttributeEncoder(model.attributes, false);
  const mask: TransitionMask = iob2TransitionMask(model.labels);
  const trans = model.weights.subarray(stateCount, stateCount + L * L);
  const expTrans = new Float64Array(L * L);
  for (let c = 0; c < L * L; c++) expTrans[c] = Math.exp(trans[c] as number) * (mask.pair[c] as number);
  const lattice = new Lattice(L);
  const viterbi = new ViterbiDecoder(L);
  const edges = new Float64Array(2 * CRF_SPAN * L);
  for (let k = 0; k < CRF_SPAN; k++) {
    idsScoresAdd(model, encoder.bos[k] as Int32Array, edges, k * L);
    idsScoresAdd(model, encoder.eos[k] as Int32Array, edges, (CRF_SPAN + k) * L);
  }
  const wordLimit = Math.max(1024, Math.floor(WORD_SCORES_BUDGET / (CRF_SPAN * L)));
  const wordScores = new Map<string, Float64Array>();
  const wordRows = (word: string): Float64Array => {
    let rows = wordScores.get(word);
    if (rows === undefined) {
      if (wordScores.size >= wordLimit) wordScores.clear();
      rows = new Float64Array(CRF_SPAN * L);
      const ids = encoder.wordIdsFresh(word);
      idsScoresAdd(model, encoder.bias, rows, CRF_WINDOW * L);
      for (let k = 0; k < CRF_SPAN; k++) idsScoresAdd(model, ids[k] as Int32Array, rows, k * L);
      wordScores.set(word, rows);
    }
    return rows;
  };
  let state = new Float64Array(64 * L);
  let path = new Int32Array(64);
  let perWord: Float64Array[] = [];

  const scores = (words: readonly string[]): Float64Array => {
    const n = words.length;
    if (state.length < n * L) state = new Float64Array(n * L * 2);
    if (perWord.length < n) perWord = new Array<Float64Array>(n * 2);
    for (let t = 0; t < n; t++) perWord[t] = wordRows(words[t] as string);
    for (let t = 0; t < n; t++) {
      const row = t * L;
      for (let j = 0; j < L; j++) state[row + j] = 0;
      for (let k = 0; k < CRF_SPAN; k++) {
        const at = t + k - CRF_WINDOW;
        const source = at < 0 ? edges : at >= n ? edges : (perWord[at] as Float64Array);
        const from = at < 0 ? k * L : at >= n ? (CRF_SPAN + k) * L : k * L;
        for (let j = 0; j < L; j++) state[row + j] = (state[row + j] as number) + (source[from + j] as number);
      }
    }
    return state;
  };
  const decode = (words: readonly string[]): number => {
    if (path.length < words.length) path = new Int32Array(words.length * 2);
    return viterbi.decode(words.length, scores(words), trans, mask.start, mask.pair, path);
  };
  const names = (n: number) => {
    const out = new Array<string>(n);
    for (let t = 0; t < n; t++) out[t] = model.labels[path[t] as number] as string;
    return out;
  };

  return {
    labels: model.labels,
    tags(words) {
      if (words.length === 0) return [];
      decode(words);
      return names(words.length);
    },
    tag(words) {
      const n = words.length;
      if (n === 0) return { tags: [], confidence: new Float64Array(0), pathProbability: 1, leastConfidence: 0 };
      const best = decode(words);
      const logZ = lattice.run(n, state, expTrans, mask.start);
      const confidence = new Float64Array(n);
      for (let t = 0; t < n; t++) confidence[t] = lattice.marginals[t * L + (path[t] as number)] as number;
      const pathProbability = Math.min(1, Math.exp(best - logZ));
      return { tags: names(n), confidence, pathProbability, leastConfidence: 1 - pathProbability };
    },
    marginals(words) {
      const n = words.length;
      if (n === 0) return new Float64Array(0);
      lattice.run(n, scores(words), expTrans, mask.start);
      return lattice.marginals.slice(0, n * L);
    },
  };
}

export function crfTagSequences(model: CrfModel, sequences: readonly Pick<CrfSequence, 'words'>[]): string[][] {
  const tagger = crfTagger(model);
  return sequences.map((s) => tagger.tags(s.words));
}
