/** The tagger's worker from the page: one worker per training run, one per pre-labelling run. */
import * as Comlink from 'comlink';
import type { CrfRunProgress, CrfTagItem, CrfTrainOutcome, CrfTrainRequest } from '../../../workers/crf-run';
import type { CrfWorkerApi } from '../../../workers/crf-train.worker';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

function crfWorker(): { api: Comlink.Remote<CrfWorkerApi>; crashed: Promise<never>; end: () => void } {
  const worker = new Worker(new URL('../../../workers/crf-train.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<CrfWorkerApi>(worker);
  return {
    api,
    crashed: workerCrashed(worker, 'tagger'),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
}

/** Cancel ends the worker at once: a half-trained model is of no use, so nothing is waited for. */
export function modelTrainStart(request: CrfTrainRequest, onProgress: (p: CrfRunProgress) => void): WorkerJob<CrfTrainOutcome> {
  return workerJobStart<Comlink.Remote<CrfWorkerApi>, CrfRunProgress, CrfTrainOutcome>(
    crfWorker(),
    (api, progress) => api.train(request, Comlink.proxy(progress)) as Promise<CrfTrainOutcome>,
    onProgress,
    'Training',
  );
}

export interface ModelTagger {
  tag(batch: string[][]): Promise<CrfTagItem[]>;
  end(): void;
}

/** A worker with `modelJson` loaded, kept for the batches of one pre-labelling run. */
export async function modelTaggerOpen(modelJson: string): Promise<ModelTagger> {
  const link = crfWorker();
  link.crashed.catch(() => undefined);
  try {
    await Promise.race([link.api.modelLoad(modelJson), link.crashed]);
  } catch (error) {
    link.end();
    throw error;
  }
  return {
    tag: (batch) => Promise.race([link.api.tag(batch), link.crashed]),
    end: link.end,
  };
}
