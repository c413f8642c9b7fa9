/** Restore from a backup off the page's thread: a big file is read, checked and stored here. */
import * as Comlink from 'comlink';
import { dbOpen, type SlotsmithDb } from '../db';
import { restoreRun, type RestoreOutcome, type RestoreProgress } from './restore-run';

let db: SlotsmithDb | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows the run. */
  run(file: Blob, onProgress: (p: RestoreProgress) => void): Promise<RestoreOutcome> {
    db ??= dbOpen();
    return restoreRun(db, file, (p) => void onProgress(p));
  },
};

export type RestoreWorkerApi = typeof api;

Comlink.expose(api);
