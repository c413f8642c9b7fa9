/**
 * Start-up cleanup: an import left 'importing' by a tab that closed or crashed is rolled back and
 * reported. An import still running in another tab must be spared: the importer holds a Web Lock
 * named `batchLockName(id)` for the whole import, and `batchActiveByLocks` asks the lock manager.
 */
import { BatchStateError, RecordMissingError } from './errors';
import { batchRollback, type BatchRollbackReport } from './batch-repo';
import type { BatchRow, SlotsmithDb } from './schema';

export const BATCH_INTERRUPTED = 'The import was interrupted (the tab was closed or crashed before it finished); nothing from it was kept.';

export interface BatchCleanOptions {
  projectId?: number;
  /** True for a batch some live tab or worker is still importing; without it every unfinished batch is cleaned. */
  isActive?: (batch: BatchRow) => boolean | Promise<boolean>;
}

export interface BatchCleanReport {
  cleaned: { batch: BatchRow; removed: BatchRollbackReport }[];
}

export function batchLockName(batchId: number): string {
  return `slotsmith-import-${batchId}`;
}

/** The part of the Web Locks API (`navigator.locks`) used here. */
export interface LockQueryable {
  query(): Promise<{ held?: { name?: string }[] }>;
}

export function batchActiveByLocks(locks: LockQueryable): (batch: BatchRow) => Promise<boolean> {
  return async (batch) => {
    const { held = [] } = await locks.query();
    return held.some((lock) => lock.name === batchLockName(batch.id));
  };
}

export async function batchesCleanUnfinished(db: SlotsmithDb, options: BatchCleanOptions = {}): Promise<BatchCleanReport> {
  const unfinished = await db.batches
    .where('state')
    .equals('importing')
    .filter((b) => options.projectId === undefined || b.projectId === options.projectId)
    .toArray();
  const report: BatchCleanReport = { cleaned: [] };
  for (const batch of unfinished) {
    if (options.isActive !== undefined && (await options.isActive(batch))) continue;
    try {
      const removed = await batchRollback(db, batch.id, { state: 'failed', failure: BATCH_INTERRUPTED, onlyIfImporting: true });
      const after = await db.batches.get(batch.id);
      report.cleaned.push({ batch: after ?? batch, removed });
    } catch (error) {
      // Another tab finished, cleaned or deleted it meanwhile: nothing left to clean.
      if (!(error instanceof BatchStateError || error instanceof RecordMissingError)) throw error;
    }
  }
  return report;
}
