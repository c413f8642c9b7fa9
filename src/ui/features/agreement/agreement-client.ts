/** One agreement run in its own worker, ended when the run ends (or is cancelled) so no idle thread stays behind. */
import * as Comlink from 'comlink';
import type { AgreementWorkerApi } from '../../../workers/agreement-dashboard.worker';
import type { AgreementOutcome, AgreementProgress, AgreementRequest } from '../../../workers/agreement-run';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

export function agreementStart(request: AgreementRequest, onProgress: (p: AgreementProgress) => void): WorkerJob<AgreementOutcome> {
  const worker = new Worker(new URL('../../../workers/agreement-dashboard.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<AgreementWorkerApi>(worker);
  const link = {
    api,
    crashed: workerCrashed(worker, 'agreement'),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
  // Comlink's Remote spreads a union result over its Promise; it is the same AgreementOutcome.
  return workerJobStart<typeof api, AgreementProgress, AgreementOutcome>(
    link,
    (a, progress) => a.agreement(request, Comlink.proxy(progress)) as Promise<AgreementOutcome>,
    onProgress,
    'The agreement computation',
  );
}
