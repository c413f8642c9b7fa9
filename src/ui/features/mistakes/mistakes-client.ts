/** One likely-mistake scan in its own worker, ended when the scan ends (or is cancelled). */
import * as Comlink from 'comlink';
import type { FindingsScan, FindingsScanProgress } from '../../../workers/findings-run';
import type { FindingsScanWorkerApi } from '../../../workers/findings-scan.worker';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

export function findingsScanStart(projectId: number, onProgress: (p: FindingsScanProgress) => void): WorkerJob<FindingsScan> {
  const worker = new Worker(new URL('../../../workers/findings-scan.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<FindingsScanWorkerApi>(worker);
  const link = {
    api,
    crashed: workerCrashed(worker, 'mistake scan'),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
  return workerJobStart<typeof api, FindingsScanProgress, FindingsScan>(
    link,
    (a, progress) => a.scan(projectId, Comlink.proxy(progress)) as Promise<FindingsScan>,
    onProgress,
    'The mistake scan',
  );
}
