/** Export in a worker, so reading and writing a large project never blocks the page. */
import * as Comlink from 'comlink';
import { dbOpen, type SlotsmithDb } from '../db';
import { exportFinish, exportGather, exportGatherKey, type ExportGathered, type ExportOutcome, type ExportProgress, type ExportRequest } from './export-run';

let db: SlotsmithDb | undefined;
/** What the last refused run read, so "as they are" writes that same snapshot without reading it again. */
let refused: { key: string; gathered: ExportGathered } | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows the run. */
  async run(request: ExportRequest, onProgress: (p: ExportProgress) => void): Promise<ExportOutcome> {
    db ??= dbOpen();
    const progress = (p: ExportProgress) => void onProgress(p);
    const key = exportGatherKey(request);
    const kept = request.asIs && refused?.key === key ? refused.gathered : undefined;
    refused = undefined;
    const gathered = kept ?? (await exportGather(db, request, progress));
    const outcome = exportFinish(gathered, request, progress);
    if (outcome.kind === 'refused') refused = { key, gathered };
    return outcome;
  },
};

export type ExportWorkerApi = typeof api;

Comlink.expose(api);
