/** One agreement run in its own worker, ended when the run ends (or is cancelled) so no idle thread stays behind. */
import * as Comlink from 'comlink';
import type { AgreementWorkerApi } from '../../../workers/agreement-dashboard.worker';
import type { AgreementOutcome, AgreementProgress, AgreementRequest, AgreementResult } from '../../../workers/agreement-run';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

/**
 * `onPoint` receives the figures without intervals first; the result then adds the intervals.
 * `fresh` computes even when the worker keeps figures for unchanged layers.
 */
export function agreementStart(request: AgreementRequest, onProgress: (p: AgreementProgress) => void, onPoint: (early: AgreementResult) => void, fresh = false): WorkerJob<AgreementOutcome> {
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
  // The early figures travel as a progress message, so none arrives after the run has settled.
  type Message = { progress: AgreementProgress } | { early: AgreementResult };
  return workerJobStart<typeof api, Message, AgreementOutcome>(
    link,
    (a, message) =>
      a.agreement(
        request,
        Comlink.proxy((progress: AgreementProgress) => message({ progress })),
        Comlink.proxy((early: AgreementResult) => message({ early })),
        fresh,
      ) as Promise<AgreementOutcome>,
    (m) => ('early' in m ? onPoint(m.early) : onProgress(m.progress)),
    'The agreement computation',
  );
}
