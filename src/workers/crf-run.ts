/**
 * The tagger's work in a worker: training (optionally with k-fold cross-validation first) with
 * progress and cooperative cancel, and tagging batches with a model kept loaded between batches.
 * Kept apart from the worker entry so it runs the same in Node tests.
 */
import {
  type CrfModel,
  crfCrossValidate,
  crfModelFromJson,
  crfModelToJson,
  type CrfSequence,
  type CrfShardHelper,
  type CrfTagger,
  crfTagger,
  crfTrain,
  type CrfTrainingRecord,
  type CrossValidation,
} from '../core/crf';

export interface CrfTrainRequest {
  sequences: CrfSequence[];
  c2?: number;
  maxIterations?: number;
  seed?: number;
  /** Cross-validate with this many folds before the final training; 0 or absent: skip. */
  folds?: number;
}

/** Training a project's model: the worker reads the training set itself (see `trainProject`). */
export type CrfProjectTrainRequest = Omit<CrfTrainRequest, 'sequences'> & { projectId: number };

/** What the training set held: utterances used, and where their labels came from. */
export interface TrainingSetInfo {
  utterances: number;
  fromGold: number;
  fromDone: number;
}

/** Not ok: fewer than two utterances to learn from. */
export type CrfProjectTrainOutcome = { ok: true; info: TrainingSetInfo; outcome: CrfTrainOutcome } | { ok: false; info: TrainingSetInfo };

/** A model file in short, or why it cannot be read. */
export type CrfModelSummary = { ok: true; labels: number; training: CrfTrainingRecord } | { ok: false; message: string };

/** Read a model file fully (the page should not: a big model takes a long task to decode). */
export function crfModelSummary(json: string): CrfModelSummary {
  try {
    const model = crfModelFromJson(json);
    return { ok: true, labels: model.labels.length, training: model.training };
  } catch (error) {
    return { ok: false, message: (error as Error).message };
  }
}

export interface CrfRunProgress {
  phase: 'cross-validating' | 'training';
  /** 0-based fold while cross-validating. */
  fold: number;
  folds: number;
  iteration: number;
  maxIterations: number;
  loss: number;
}

export interface CrfTrainOutcome {
  /** The model file (see core/crf/model-file.ts), ready to store or export. */
  modelJson: string;
  training: CrfTrainingRecord;
  crossValidation: CrossValidation | null;
}

export interface CrfTagItem {
  tags: string[];
  /** Per token, the marginal probability of its tag. */
  confidence: number[];
  /** 1 − P(best path): sort descending to put the most useful utterances first. */
  leastConfidence: number;
}

/** Lets pending messages (a cancel) in between iterations: a task turn in a worker, a timer turn in Node. */
export const taskTurn = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

export interface CrfRunner {
  /** Trains with the runner's helper threads (see CrfHelpersStart), started for this run and ended after. */
  train(request: CrfTrainRequest, onProgress: (p: CrfRunProgress) => void): Promise<CrfTrainOutcome>;
  /** Trains with the given helper threads, left running. */
  trainWith(request: CrfTrainRequest, onProgress: (p: CrfRunProgress) => void, helpers: readonly CrfShardHelper[]): Promise<CrfTrainOutcome>;
  /** Stop a running `train` after its current iteration; it rejects with CrfTrainCancelledError. */
  cancel(): void;
  /** Load a model for `tag`; returns its labels. */
  modelLoad(modelJson: string): string[];
  tag(batch: readonly (readonly string[])[]): CrfTagItem[];
}

/** Helper threads for one training run (cross-validation and final model share them), ended after it. */
export type CrfHelpersStart = () => { helpers: readonly CrfShardHelper[]; end(): void };

export function crfRunnerCreate(turn: () => Promise<void> = taskTurn, helpersStart: CrfHelpersStart = () => ({ helpers: [], end: () => {} })): CrfRunner {
  let cancelled = false;
  let tagger: CrfTagger | null = null;
  const trainWith: CrfRunner['trainWith'] = async (request, onProgress, shardHelpers) => {
    cancelled = false;
    const base = {
      ...(request.c2 !== undefined && { c2: request.c2 }),
      ...(request.maxIterations !== undefined && { maxIterations: request.maxIterations }),
      ...(request.seed !== undefined && { seed: request.seed }),
      isCancelled: () => cancelled,
      shardHelpers,
    };
    const folds = request.folds ?? 0;
    let crossValidation: CrossValidation | null = null;
    if (folds >= 2) {
      crossValidation = await crfCrossValidate(request.sequences, {
        ...base,
        folds,
        onProgress: async (p) => {
          onProgress({ phase: 'cross-validating', fold: p.fold, folds, iteration: p.iteration, maxIterations: p.maxIterations, loss: p.loss });
          await turn();
        },
      });
    }
    const model: CrfModel = await crfTrain(request.sequences, {
      ...base,
      onProgress: async (p) => {
        onProgress({ phase: 'training', fold: 0, folds, iteration: p.iteration, maxIterations: p.maxIterations, loss: p.loss });
        await turn();
      },
    });
    tagger = crfTagger(model);
    return { modelJson: crfModelToJson(model), training: model.training, crossValidation };
  };
  return {
    async train(request, onProgress) {
      const threads = helpersStart();
      try {
        return await trainWith(request, onProgress, threads.helpers);
      } finally {
        threads.end();
      }
    },
    trainWith,
    cancel() {
      cancelled = true;
    },
    modelLoad(modelJson) {
      const model = crfModelFromJson(modelJson);
      tagger = crfTagger(model);
      return model.labels;
    },
    tag(batch) {
      if (tagger === null) throw new Error('crf worker: no model loaded');
      const current = tagger;
      return batch.map((words) => {
        const result = current.tag(words);
        return { tags: result.tags, confidence: Array.from(result.confidence), leastConfidence: result.leastConfidence };
      });
    },
  };
}
