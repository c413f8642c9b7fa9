/** CRF training and tagging off the page's thread; `cancel` is answered between iterations. */
import * as Comlink from 'comlink';
import { crfRunnerCreate, type CrfRunProgress, type CrfTrainRequest } from './crf-run';

const runner = crfRunnerCreate();

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows training. */
  train(request: CrfTrainRequest, onProgress: (p: CrfRunProgress) => void) {
    return runner.train(request, (p) => void onProgress(p));
  },
  cancel() {
    runner.cancel();
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
