/** One overview pass in its own worker (the agreement worker's second entry), ended when it ends. */
import * as Comlink from 'comlink';
import type { AgreementWorkerApi } from '../../../workers/agreement-dashboard.worker';
import type { OverviewRequest, OverviewResult } from '../../../workers/agreement-overview';
import type { LayerScanProgress } from '../../../workers/agreement-read';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

export function overviewStart(request: OverviewRequest, onProgress: (p: LayerScanProgress) => void): WorkerJob<OverviewResult> {
  const worker = new Worker(new URL('../../../workers/agreement-dashboard.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<AgreementWorkerApi>(worker);
  const link = {
    api,
    crashed: workerCrashed(worker, 'overview'),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
  return workerJobStart<typeof api, LayerScanProgress, OverviewResult>(link, (a, progress) => a.overview(request, Comlink.proxy(progress)), onProgress, 'The overview');
}
