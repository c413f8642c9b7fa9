/** The likely-mistake scan in a worker: reading, tagging and n-gram passes never block the page. */
import * as Comlink from 'comlink';
import { dbOpen, type SlotsmithDb } from '../db';
import { findingsScan, type FindingsScan, type FindingsScanProgress } from './findings-run';

let db: SlotsmithDb | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows the scan. */
  scan(projectId: number, onProgress: (p: FindingsScanProgress) => void): Promise<FindingsScan> {
    db ??= dbOpen();
    return findingsScan(db, projectId, (p) => void onProgress(p));
  },
};

export type FindingsScanWorkerApi = typeof api;

Comlink.expose(api);
