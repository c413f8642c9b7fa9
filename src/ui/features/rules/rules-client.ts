/** One rule scan in its own worker, ended when the scan ends (or is cancelled). */
import * as Comlink from 'comlink';
import type { RulesScan, RulesScanProgress } from '../../../db/rules-repo';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';
import type { RulesScanWorkerApi } from '../../../workers/rules-scan.worker';

export function rulesScanStart(projectId: number, onProgress: (p: RulesScanProgress) => void): WorkerJob<RulesScan> {
  const worker = new Worker(new URL('../../../workers/rules-scan.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<RulesScanWorkerApi>(worker);
  const link = {
    api,
    crashed: workerCrashed(worker, 'rule scan'),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
  return workerJobStart<typeof api, RulesScanProgress, RulesScan>(link, (a, progress) => a.scan(projectId, Comlink.proxy(progress)) as Promise<RulesScan>, onProgress, 'The rule scan');
}
