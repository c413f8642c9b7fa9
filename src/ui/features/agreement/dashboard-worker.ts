/**
 * The agreement worker, kept between runs. Starting it, loading its code, starting its bootstrap
 * helpers and bringing the JIT up to speed cost more than a run on unchanged or lightly edited
 * layers; and what it stored last stays in its memory. So a run that ends normally hands the worker
 * back, and it is ended only after IDLE_MS without a run. A cancelled or crashed run ends its worker
 * at once (a cancel must stop the work), and a second run while one is going gets a worker of its own,
 * ended when it ends.
 */
import * as Comlink from 'comlink';
import type { AgreementWorkerApi } from '../../../workers/agreement-dashboard.worker';
import { workerCrashed, workerJobStart, type WorkerJob } from '../../../workers/worker-job';

/** Ten minutes: long enough for a round of edits between two looks at the figures; memory (copies of the layers) is given back after. */
export const IDLE_MS = 10 * 60_000;

interface Kept {
  worker: Worker;
  api: Comlink.Remote<AgreementWorkerApi>;
  crashed: Promise<never>;
  busy: boolean;
  idle: ReturnType<typeof setTimeout> | null;
  gone: boolean;
}

let kept: Kept | null = null;

function keptEnd(k: Kept): void {
  if (kept === k) kept = null;
  if (k.gone) return;
  k.gone = true;
  if (k.idle !== null) clearTimeout(k.idle);
  k.api[Comlink.releaseProxy]();
  k.worker.terminate();
}

function started(what: string): Kept {
  const worker = new Worker(new URL('../../../workers/agreement-dashboard.worker.ts', import.meta.url), { type: 'module' });
  const k: Kept = { worker, api: Comlink.wrap<AgreementWorkerApi>(worker), crashed: workerCrashed(worker, what), busy: false, idle: null, gone: false };
  k.crashed.catch(() => keptEnd(k));
  return k;
}

/** One run on the kept worker (or a worker of its own when the kept one is busy). */
export function dashboardJobStart<P, T>(what: string, call: (api: Comlink.Remote<AgreementWorkerApi>, onProgress: (p: P) => void) => Promise<T>, onProgress: (p: P) => void, label: string): WorkerJob<T> {
  const own = kept === null || kept.busy;
  const k = own ? started(what) : (kept as Kept);
  if (kept === null) kept = k;
  if (k.idle !== null) clearTimeout(k.idle);
  k.idle = null;
  k.busy = true;
  let finished = false;
  const link = {
    api: k.api,
    crashed: k.crashed,
    end: () => {
      k.busy = false;
      if (!finished || kept !== k) {
        keptEnd(k);
        return;
      }
      k.idle = setTimeout(() => keptEnd(k), IDLE_MS);
    },
  };
  return workerJobStart(
    link,
    (api, progress) => {
      const running = call(api, progress);
      // Settled by the worker itself (a result or its own error): the worker is fine to keep.
      void running.then(
        () => (finished = true),
        () => (finished = true),
      );
      return running;
    },
    onProgress,
    label,
  );
}

/**
 * Starts the worker ahead of a first run (when a project opens): its code loads, its helpers start
 * and the bootstrap's code is optimised meanwhile. Idle like after a run: ended after IDLE_MS.
 */
export function dashboardWorkerWarm(): void {
  if (kept !== null) return;
  const k = started('agreement');
  kept = k;
  k.api.warm().catch(() => keptEnd(k));
  k.idle = setTimeout(() => keptEnd(k), IDLE_MS);
}
