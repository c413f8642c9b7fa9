/** The rule review's scan in a worker: validating every layer of a large project never blocks the page. */
import * as Comlink from 'comlink';
import { dbOpen, type SlotsmithDb } from '../db';
import { rulesScan, type RulesScan, type RulesScanProgress } from '../db/rules-repo';

let db: SlotsmithDb | undefined;

const api = {
  /** `onProgress` arrives as a Comlink proxy; its calls are not awaited, so progress never slows the scan. */
  scan(projectId: number, onProgress: (p: RulesScanProgress) => void): Promise<RulesScan> {
    db ??= dbOpen();
    return rulesScan(db, projectId, (p) => void onProgress(p));
  },
};

export type RulesScanWorkerApi = typeof api;

Comlink.expose(api);
