/** The agreement worker run behind the screen: started for each new request, cancellable, never blocking the page. */
import { startTransition, useCallback, useEffect, useRef, useState } from 'react';
import type { AgreementOutcome, AgreementProgress, AgreementRequest, AgreementResult } from '../../../workers/agreement-run';
import { JobCancelledError, type WorkerJob } from '../../../workers/worker-job';
import { agreementStart } from './agreement-client';
import { withEarlyParts } from './early-parts';

export type AgreementRunState =
  | { kind: 'idle' }
  | { kind: 'running'; progress: AgreementProgress | null }
  | { kind: 'done'; outcome: AgreementOutcome; stamp: string }
  | { kind: 'cancelled' }
  | { kind: 'failed'; message: string };

/**
 * Runs `request` whenever it changes (by value) or `again` is called; cancel ends the worker at once.
 * `stamp` (what the data looked like at the start) is handed back with the result, so the screen can
 * tell when the figures no longer match the layers.
 */
export function useAgreementRun(request: AgreementRequest | null, stamp: string): { state: AgreementRunState; early: AgreementResult | null; cancel: () => void; again: () => void } {
  const [state, setState] = useState<AgreementRunState>({ kind: 'idle' });
  /** The figures without intervals while the intervals are resampled. */
  const [early, setEarly] = useState<AgreementResult | null>(null);
  const [round, setRound] = useState(0);
  const job = useRef<WorkerJob<AgreementOutcome> | null>(null);
  /** Set by `again`: that run computes even when the worker keeps figures for unchanged layers. */
  const freshNext = useRef(false);
  const key = request === null ? '' : JSON.stringify(request);
  const stampNow = useRef(stamp);
  useEffect(() => {
    stampNow.current = stamp;
  }, [stamp]);

  useEffect(() => {
    if (key === '') return;
    const fresh = freshNext.current;
    freshNext.current = false;
    const started = agreementStart(
      JSON.parse(key) as AgreementRequest,
      (progress) => setState({ kind: 'running', progress }),
      // A transition: React renders the dashboard in slices that yield to the page, not in one long task.
      (figures) => {
        shown = figures;
        startTransition(() => setEarly(figures));
      },
      fresh,
    );
    job.current = started;
    const startStamp = stampNow.current;
    // The first paint of the run comes from the worker's first progress message; until then, say it started.
    queueMicrotask(() => {
      if (job.current !== started) return;
      setState({ kind: 'running', progress: null });
      setEarly(null);
    });
    let shown: AgreementResult | null = null;
    started.result.then(
      (outcome) => {
        if (job.current === started) startTransition(() => setState({ kind: 'done', outcome: withEarlyParts(outcome, shown), stamp: startStamp }));
      },
      (error: unknown) => {
        if (job.current !== started) return;
        setState(error instanceof JobCancelledError ? { kind: 'cancelled' } : { kind: 'failed', message: (error as Error).message });
      },
    );
    return () => {
      if (job.current === started) job.current = null;
      started.cancel();
    };
  }, [key, round]);

  const cancel = useCallback(() => job.current?.cancel(), []);
  const again = useCallback(() => {
    freshNext.current = true;
    setRound((r) => r + 1);
  }, []);
  return { state, early, cancel, again };
}
