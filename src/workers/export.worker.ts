/** Export in a worker, so reading and writing a large project never blocks the page. */
import * as Comlink from 'comlink';
import { dbOpen, type SlotsmithDb } from '../db';
import { exportRun, type ExportOutcome, type ExportProgress, type ExportRequest } from './export-run';

let db: SlotsmithDb | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows the run. */
  run(request: ExportRequest, onProgress: (p: ExportProgress) => void): Promise<ExportOutcome> {
    db ??= dbOpen();
    return exportRun(db, request, (p) => void onProgress(p));
  },
};

export type ExportWorkerApi = typeof api;

Comlink.expose(api);
