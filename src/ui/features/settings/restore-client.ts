/** One restore in its own worker, ended when the restore ends or is stopped. */
import * as Comlink from 'comlink';
import type { RestoreWorkerApi } from '../../../workers/restore.worker';
import type { RestoreOutcome, RestoreProgress } from '../../../workers/restore-run';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

export function restoreStart(file: File, onProgress: (p: RestoreProgress) => void): WorkerJob<RestoreOutcome> {
  const worker = new Worker(new URL('../../../workers/restore.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<RestoreWorkerApi>(worker);
  const link = {
    api,
    crashed: workerCrashed(worker, 'restore'),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
  // Comlink's Remote spreads a union result over its Promise; it is the same RestoreOutcome.
  return workerJobStart<typeof api, RestoreProgress, RestoreOutcome>(link, (a, progress) => a.run(file, Comlink.proxy(progress)) as Promise<RestoreOutcome>, onProgress, 'The restore');
}
