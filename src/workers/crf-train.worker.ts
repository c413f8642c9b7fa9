/** CRF training and tagging off the page's thread; `cancel` is answered between iterations. */
import * as Comlink from 'comlink';
import { modelTrainingSet } from '../db/model-repo';
import { dbOpen, type SlotsmithDb } from '../db/schema';
import { crfModelSummary, crfRunnerCreate, type CrfProjectTrainOutcome, type CrfProjectTrainRequest, type CrfRunProgress, type CrfTrainRequest, type TrainingSetInfo } from './crf-run';
import { crfHelpersStart } from './crf-shard-helpers';

// Training shares forward–backward with nested workers (see crf-shard-helpers.ts); the model does not depend on how many.
const runner = crfRunnerCreate(undefined, () => crfHelpersStart());
let db: SlotsmithDb | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows training. */
  train(request: CrfTrainRequest, onProgress: (p: CrfRunProgress) => void) {
    return runner.train(request, (p) => void onProgress(p));
  },
  /**
   * Read the project's training set here, over the worker's own connection, then train: the page
   * never holds (or copies) the layers. `onSet` says what was read before training starts.
   */
  async trainProject(request: CrfProjectTrainRequest, onSet: (info: TrainingSetInfo) => void, onProgress: (p: CrfRunProgress) => void): Promise<CrfProjectTrainOutcome> {
    db ??= dbOpen();
    const set = await modelTrainingSet(db, request.projectId);
    const info: TrainingSetInfo = { utterances: set.sequences.length, fromGold: set.fromGold, fromDone: set.fromDone };
    void onSet(info);
    if (set.sequences.length < 2) return { ok: false, info };
    const { projectId: _projectId, ...options } = request;
    const folds = Math.min(options.folds ?? 0, set.sequences.length);
    const outcome = await runner.train({ ...options, sequences: set.sequences, folds: folds >= 2 ? folds : 0 }, (p) => void onProgress(p));
    return { ok: true, info, outcome };
  },
  cancel() {
    runner.cancel();
  },
  summary(modelJson: string) {
    return crfModelSummary(modelJson);
  },
  modelLoad(modelJson: string) {
    return runner.modelLoad(modelJson);
  },
  tag(batch: string[][]) {
    return runner.tag(batch);
  },
};

export type CrfWorkerApi = typeof api;

Comlink.expose(api);
