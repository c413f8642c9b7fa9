/**
 * Export runs in a worker of their own, ended when the run ends or is cancelled so no idle thread
 * stays behind; after a refusal the worker is kept, holding what it read, so "as they are" writes
 * that very snapshot (the one the refusal list describes) without reading the project again.
 */
import * as Comlink from 'comlink';
import type { ExportWorkerApi } from '../../../workers/export.worker';
import type { ExportOutcome, ExportProgress, ExportRequest } from '../../../workers/export-run';
import { workerCrashed, workerJobStart, type WorkerJob, type WorkerLink } from '../../../workers/worker-job';

/** A worker kept after a refusal; `end` lets it go when the refusal is dismissed. */
export interface ExportWorkerKept {
  link: WorkerLink<Comlink.Remote<ExportWorkerApi>>;
  keep: { on: boolean };
  end(): void;
}

function exportWorkerOpen(): ExportWorkerKept {
  const worker = new Worker(new URL('../../../workers/export.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<ExportWorkerApi>(worker);
  const keep = { on: false };
  const terminate = () => {
    api[Comlink.releaseProxy]();
    worker.terminate();
  };
  const link = {
    api,
    crashed: workerCrashed(worker, 'export'),
    end: () => {
      if (!keep.on) terminate();
    },
  };
  return { link, keep, end: terminate };
}

/** Start a run, in the kept worker when given (its refusal's "as they are"), else in a new one. */
export function exportStart(request: ExportRequest, onProgress: (p: ExportProgress) => void, kept?: ExportWorkerKept): { job: WorkerJob<ExportOutcome>; worker: ExportWorkerKept } {
  const worker = kept ?? exportWorkerOpen();
  worker.keep.on = false;
  const call = async (api: Comlink.Remote<ExportWorkerApi>, progress: (p: ExportProgress) => void) => {
    // Comlink's Remote spreads a union result over its Promise; it is the same ExportOutcome.
    const outcome = (await api.run(request, Comlink.proxy(progress))) as ExportOutcome;
    worker.keep.on = outcome.kind === 'refused';
    return outcome;
  };
  return { job: workerJobStart(worker.link, call, onProgress, 'The export'), worker };
}
