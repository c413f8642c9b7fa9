/** One agreement run on the page's agreement worker (kept between runs: see dashboard-worker.ts). */
import * as Comlink from 'comlink';
import type { AgreementOutcome, AgreementProgress, AgreementRequest, AgreementResult } from '../../../workers/agreement-run';
import type { WorkerJob } from '../../../workers/worker-job';
import { dashboardJobStart } from './dashboard-worker';

/**
 * `onPoint` receives the figures without intervals first; the result then adds the intervals.
 * `fresh` computes even when the worker keeps figures for unchanged layers.
 */
export function agreementStart(request: AgreementRequest, onProgress: (p: AgreementProgress) => void, onPoint: (early: AgreementResult) => void, fresh = false): WorkerJob<AgreementOutcome> {
  // Comlink's Remote spreads a union result over its Promise; it is the same AgreementOutcome.
  // The early figures travel as a progress message, so none arrives after the run has settled.
  type Message = { progress: AgreementProgress } | { early: AgreementResult };
  return dashboardJobStart<Message, AgreementOutcome>(
    'agreement',
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
