import type { CrfSequence } from './dataset';
import { AttributeEncoder } from './encoder';
import { IntBuffer } from './int-buffer';
import { iob2TransitionMask, type TransitionMask } from './labels';
import { Lattice } from './lattice';
import { type CrfModel, stateScoresFill } from './model';
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

/** A tagger over a model: encodes words, decodes under the IOB2 mask, never emits an illegal transition. */
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
  let state = new Float64Array(64 * L);
  let path = new Int32Array(64);
  const ids = new IntBuffer(4096);
  const ends = new IntBuffer(256);

  const scores = (words: readonly string[]): Float64Array => {
    ids.length = 0;
    ends.length = 0;
    encoder.encode(words, ids, ends);
    if (state.length < words.length * L) state = new Float64Array(words.length * L * 2);
    stateScoresFill(model.featureStarts, model.featureLabels, model.weights, L, ends.data, ids.data, 0, words.length, state);
    return state;
  };
  const decode = (words: readonly string[]): number => {
    if (path.length < words.length) path = new Int32Array(words.length * 2);
    return viterbi.decode(words.length, scores(words), trans, mask.start, mask.pair, path);
  };
  const names = (n: number) => Array.from(path.subarray(0, n), (id) => model.labels[id] as string);

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
