/**
 * The page's side of one run in a worker of its own: the result, the worker's crash, or a cancel,
 * whichever comes first; then the worker ends. Progress travels on a port of its own (a Comlink
 * proxy), and the HTML standard orders messages per port only, so a progress message may arrive
 * after the result: once the run has settled, late progress is dropped instead of repainting a
 * finished screen as still running.
 */

/** The run was cancelled by the user; nothing it made is handed over. */
export class JobCancelledError extends Error {
  override name = 'JobCancelledError';
  constructor(what = 'The run') {
    super(`${what} was cancelled; nothing was kept.`);
  }
}

export interface WorkerLink<Api> {
  api: Api;
  /** Rejects when the worker fails to load or crashes (its `error` event): such a worker never answers. */
  crashed: Promise<never>;
  /** Ends the worker (Worker.terminate): whatever it was doing stops at once. */
  end(): void;
}

export interface WorkerJob<T> {
  result: Promise<T>;
  /** Ends the worker and rejects `result` with JobCancelledError; no effect once settled. */
  cancel(): void;
}

export function workerJobStart<Api, P, T>(
  link: WorkerLink<Api>,
  call: (api: Api, onProgress: (p: P) => void) => Promise<T>,
  onProgress: (p: P) => void = () => {},
  what?: string,
): WorkerJob<T> {
  let open = true;
  let cancelNow: (error: Error) => void = () => {};
  const cancelled = new Promise<never>((_, reject) => {
    cancelNow = reject;
  });
  // Either may reject after the race is decided: keep those late rejections from being reported as unhandled.
  cancelled.catch(() => undefined);
  link.crashed.catch(() => undefined);
  const progress = (p: P) => {
    if (open) onProgress(p);
  };
  let running: Promise<T>;
  try {
    running = call(link.api, progress);
  } catch (error) {
    running = Promise.reject(error as Error);
  }
  // A cancelled or crashed run's call never settles; a late rejection of it is of no interest.
  running.catch(() => undefined);
  const result = Promise.race([running, link.crashed, cancelled]).finally(() => {
    // Runs before the caller's continuation: no progress reaches it after the outcome.
    open = false;
    link.end();
  });
  return {
    result,
    cancel: () => {
      if (open) cancelNow(new JobCancelledError(what));
    },
  };
}

/** The `crashed` promise of a real Worker. */
export function workerCrashed(worker: Worker, what: string): Promise<never> {
  return new Promise<never>((_, reject) =>
    worker.addEventListener('error', (event) => reject(new Error(event.message || `the ${what} worker stopped unexpectedly`)), { once: true }),
  );
}
