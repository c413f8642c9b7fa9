/** The tagger's worker from the page: one worker per training run, one per pre-labelling run. */
import * as Comlink from 'comlink';
import type { CrfModelSummary, CrfProjectTrainOutcome, CrfProjectTrainRequest, CrfRunProgress, CrfTagItem, TrainingSetInfo } from '../../../workers/crf-run';
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

/**
 * Train on the project's finished layers, read in the worker (the page never holds them): `onSet`
 * hears what was read, then `onProgress` the iterations. Cancel ends the worker at once.
 */
export function modelTrainProjectStart(request: CrfProjectTrainRequest, onSet: (info: TrainingSetInfo) => void, onProgress: (p: CrfRunProgress) => void): WorkerJob<CrfProjectTrainOutcome> {
  type Message = { set: TrainingSetInfo } | { progress: CrfRunProgress };
  return workerJobStart<Comlink.Remote<CrfWorkerApi>, Message, CrfProjectTrainOutcome>(
    crfWorker(),
    (api, message) =>
      api.trainProject(
        request,
        Comlink.proxy((set: TrainingSetInfo) => message({ set })),
        Comlink.proxy((progress: CrfRunProgress) => message({ progress })),
      ) as Promise<CrfProjectTrainOutcome>,
    (m) => ('set' in m ? onSet(m.set) : onProgress(m.progress)),
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

/** A model file read in a worker (decoding a big model on the page is a long task); the worker ends after. */
export async function modelSummaryRead(modelJson: string): Promise<CrfModelSummary> {
  const link = crfWorker();
  link.crashed.catch(() => undefined);
  try {
    return await Promise.race([link.api.summary(modelJson), link.crashed]);
  } finally {
    link.end();
  }
}
