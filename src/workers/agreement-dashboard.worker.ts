/**
 * The agreement and overview computations off the page's thread, over the worker's own database
 * connection. The page keeps this worker between runs (src/ui/features/agreement/dashboard-worker.ts),
 * so its bootstrap helpers stay started and what it stored last stays in memory (memory-stores.ts).
 */
import * as Comlink from 'comlink';
import { agreementCacheOpen, type AgreementCache } from '../db/agreement-cache';
import { bootstrapStoreOpen, type BootstrapStore } from '../db/bootstrap-store';
import { layerCopyStoreOpen, type LayerCopyStore } from '../db/layer-copy-store';
import { dbOpen, type SlotsmithDb } from '../db/schema';
import type { AgreementBootstrapApi } from './agreement-bootstrap.worker';
import { bootstrapParallel, bootstrapPatchParallel, type BootstrapHelper } from './agreement-parallel';
import type { LayerScanProgress } from './agreement-read';
import { agreementRun, type AgreementOutcome, type AgreementProgress, type AgreementRequest, type AgreementResult } from './agreement-run';
import { overviewRun, type OverviewRequest, type OverviewResult } from './agreement-overview';
import { bootstrapWarm } from './bootstrap-warm';
import { bootstrapStoreRemembered, layerCopyStoreRemembered, WriteHold } from './memory-stores';
import { workerCrashed } from './worker-job';

let db: SlotsmithDb | undefined;
let cache: AgreementCache<AgreementResult> | undefined;
let copies: LayerCopyStore | undefined;
let totals: BootstrapStore | undefined;
/** Cache writes wait while an agreement run is going: they are made once it has answered. */
const writes = new WriteHold();

/** One helper per further core, up to three: the page's own thread stays free, as it waits on us. */
function helperStart(): BootstrapHelper & { crashed: Promise<never> } {
  const worker = new Worker(new URL('./agreement-bootstrap.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<AgreementBootstrapApi>(worker);
  // A helper that fails to load never answers: its error event fails the run instead of hanging it.
  const crashed = workerCrashed(worker, 'bootstrap helper');
  crashed.catch(() => undefined);
  return {
    crashed,
    range: (rows, layout, seed, from, to) => Promise.race([api.range(rows, layout, seed, from, to), crashed]),
    patch: (plan, from, to) => Promise.race([api.patch(plan, from, to), crashed]),
    end: () => {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
}

/**
 * Helpers started at the first request, so they load while the layers are read, and kept for the
 * next run (their start is paid once). A helper that crashed is ended and replaced next time.
 */
let pool: (BootstrapHelper & { crashed: Promise<never>; failed: boolean })[] = [];

function poolFill(): void {
  const cores = typeof navigator === 'undefined' ? 1 : (navigator.hardwareConcurrency ?? 1);
  const count = Math.max(0, Math.min(3, cores - 1));
  pool = pool.filter((h) => !h.failed);
  while (pool.length < count) {
    const helper = { ...helperStart(), failed: false };
    helper.crashed.catch(() => {
      helper.failed = true;
      helper.end();
    });
    pool.push(helper);
  }
}

/** The pooled helpers as the parallel runners take them: ending one after a run keeps it for the next. */
function helpersLend(): BootstrapHelper[] {
  poolFill();
  return pool.map((h) => ({ range: h.range, patch: h.patch, end: () => undefined }));
}

const api = {
  /**
   * Made ready before the first run (the page calls this when a project opens): helpers started and
   * the bootstrap's code optimised on both threads, off the path of the run itself.
   */
  warm(): void {
    poolFill();
    bootstrapWarm();
  },
  /** Callbacks arrive as Comlink proxies; their calls are not awaited, so the page never slows the run. */
  /** `fresh`: compute even when figures for unchanged layers are kept ("Compute again"). */
  agreement(request: AgreementRequest, onProgress: (p: AgreementProgress) => void, onPoint?: (early: AgreementResult) => void, fresh = false): Promise<AgreementOutcome> {
    db ??= dbOpen();
    cache ??= agreementCacheOpen<AgreementResult>(indexedDB);
    copies ??= layerCopyStoreRemembered(layerCopyStoreOpen(indexedDB), writes);
    totals ??= bootstrapStoreRemembered(bootstrapStoreOpen(indexedDB), writes);
    if ((request.bootstrap ?? 1000) > 0) poolFill();
    writes.hold();
    const run = agreementRun(db, request, (p) => void onProgress(p), {
      ...(onPoint !== undefined && { onPoint: (early: AgreementResult) => void onPoint(early) }),
      bootstrap: bootstrapParallel(helpersLend),
      patch: bootstrapPatchParallel(helpersLend),
      cache,
      copies,
      totals,
      fresh,
      // The page keeps this worker after the answer: stores finish meanwhile (memory-stores.ts holds them already).
      storeAfter: (writing) => void writing.catch(() => undefined),
    });
    // A task after the answer (Comlink posts it as the run settles, in microtasks): then the held writes.
    void run.finally(() => setTimeout(() => writes.release(), 0)).catch(() => undefined);
    return run;
  },
  overview(request: OverviewRequest, onProgress: (p: LayerScanProgress) => void): Promise<OverviewResult> {
    db ??= dbOpen();
    copies ??= layerCopyStoreRemembered(layerCopyStoreOpen(indexedDB), writes);
    return overviewRun(db, request, (p) => void onProgress(p), copies);
  },
};

export type AgreementWorkerApi = typeof api;

Comlink.expose(api);
