/** The agreement and overview computations off the page's thread, over the worker's own database connection. */
import * as Comlink from 'comlink';
import { dbOpen, type SlotsmithDb } from '../db/schema';
import type { LayerScanProgress } from './agreement-read';
import { agreementRun, type AgreementOutcome, type AgreementProgress, type AgreementRequest } from './agreement-run';
import { overviewRun, type OverviewRequest, type OverviewResult } from './agreement-overview';

let db: SlotsmithDb | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows the run. */
  agreement(request: AgreementRequest, onProgress: (p: AgreementProgress) => void): Promise<AgreementOutcome> {
    db ??= dbOpen();
    return agreementRun(db, request, (p) => void onProgress(p));
  },
  overview(request: OverviewRequest, onProgress: (p: LayerScanProgress) => void): Promise<OverviewResult> {
    db ??= dbOpen();
    return overviewRun(db, request, (p) => void onProgress(p));
  },
};

export type AgreementWorkerApi = typeof api;

Comlink.expose(api);
