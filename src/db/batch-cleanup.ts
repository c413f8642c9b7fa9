/**
 * Start-up cleanup: an import left 'importing' by a tab that closed or crashed is rolled back and
 * reported. An import still running in another tab must be spared: the importer holds a Web Lock
 * named `batchLockName(id)` for the whole import, and `batchActiveByLocks` asks the lock manager.
 *
 * The batch row exists before its lock can be taken (the lock is named after the row's id). So the
 * importer holds BATCH_BEGIN_LOCK from before it adds the row until its batch lock is granted, and
 * the cleanup asks which locks are held only while holding BATCH_BEGIN_LOCK too: a batch it sees
 * without a held lock then has no live importer. A lock rather than an age limit: a busy tab may
 * take any time between the two steps, and a lock needs no guessed number of seconds.
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

/** Held by an importer from before it adds its batch row until it holds that batch's own lock. */
export const BATCH_BEGIN_LOCK = 'slotsmith-import-begin';

/** The part of the Web Locks API (`navigator.locks`) used here; `request` closes the begin gap. */
export interface LockQueryable {
  query(): Promise<{ held?: { name?: string }[] }>;
  request?<T>(name: string, work: () => Promise<T>): Promise<T>;
}

export function batchActiveByLocks(locks: LockQueryable): (batch: BatchRow) => Promise<boolean> {
  const heldNames = async () => {
    const { held = [] } = await locks.query();
    return held.map((lock) => lock.name);
  };
  return async (batch) => {
    // Waits out an importer between adding its row and taking its lock (see the file comment).
    const names = locks.request === undefined ? await heldNames() : await locks.request(BATCH_BEGIN_LOCK, heldNames);
    return names.includes(batchLockName(batch.id));
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
