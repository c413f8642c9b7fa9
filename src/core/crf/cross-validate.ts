import { mulberry32Floats } from '../random';
import type { CrfSequence } from './dataset';
import { type SpanEvaluation, SpanTally } from './evaluate';
import { crfTagger } from './tagger';
import { crfTrain, type CrfTrainOptions, type CrfTrainProgress } from './train';

export interface CrossValidationOptions extends Omit<CrfTrainOptions, 'onProgress'> {
  folds?: number;
  onProgress?: (progress: CrfTrainProgress & { fold: number; folds: number }) => void | Promise<void>;
}

export interface CrossValidation {
  folds: number;
  /** Counts pooled over all folds (each utterance is tested once), per slot and overall. */
  pooled: SpanEvaluation;
  perFold: SpanEvaluation[];
}

/** Fold of each sequence: a seeded Fisher–Yates shuffle dealt round-robin, so fold sizes differ by at most one. */
export function foldsAssign(count: number, folds: number, seed: number): Int32Array {
  const order = Array.from({ length: count }, (_, i) => i);
  const random = mulberry32Floats(seed);
  for (let i = count - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [order[i], order[j]] = [order[j] as number, order[i] as number];
  }
  const fold = new Int32Array(count);
  order.forEach((index, position) => {
    fold[index] = position % folds;
  });
  return fold;
}

/** k-fold cross-validated span F1 (CoNLL-2000 exact match); folds follow `seed`. */
export async function crfCrossValidate(sequences: readonly CrfSequence[], options: CrossValidationOptions = {}): Promise<CrossValidation> {
  const folds = options.folds ?? 5;
  if (!Number.isInteger(folds) || folds < 2 || folds > sequences.length) throw new RangeError(`crfCrossValidate: need 2 ≤ folds ≤ ${sequences.length}`);
  const assignment = foldsAssign(sequences.length, folds, options.seed ?? 0);
  const pooled = new SpanTally();
  const perFold: SpanEvaluation[] = [];
  const { onProgress, folds: _folds, ...train } = options;
  for (let k = 0; k < folds; k++) {
    const training = sequences.filter((_, i) => assignment[i] !== k);
    const testing = sequences.filter((_, i) => assignment[i] === k);
    const model = await crfTrain(training, {
      ...train,
      ...(onProgress !== undefined && { onProgress: (p) => onProgress({ ...p, fold: k, folds }) }),
    });
    const tagger = crfTagger(model);
    const tally = new SpanTally();
    for (const sequence of testing) {
      const predicted = tagger.tags(sequence.words);
      tally.add(sequence.tags, predicted);
      pooled.add(sequence.tags, predicted);
    }
    perFold.push(tally.result());
  }
  return { folds, pooled: pooled.result(), perFold };
}
