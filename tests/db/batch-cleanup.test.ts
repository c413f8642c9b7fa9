import { describe, expect, it } from 'vitest';
import { BATCH_INTERRUPTED, batchActiveByLocks, batchesCleanUnfinished, batchLockName } from '../../src/db/batch-cleanup';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { dbTest, SAMPLE } from './helpers';

async function setUp(db: SlotsmithDb) {
  const p = await projectCreate(db, { name: 'A' });
  const q = await projectCreate(db, { name: 'B' });
  const done = await batchBegin(db, p.id, { fileName: 'done.iob', format: 'columns', annotator: 'ana' });
  await batchAppend(db, done, { utterances: SAMPLE });
  await batchFinish(db, done, { utterances: SAMPLE.length });
  // Left 'importing' by a tab that closed after two chunks.
  const orphan = await batchBegin(db, p.id, { fileName: 'orphan.iob', format: 'columns', annotator: 'ana' });
  await batchAppend(db, orphan, { utterances: SAMPLE.slice(0, 2) });
  await batchAppend(db, orphan, { utterances: SAMPLE.slice(2) });
  const elsewhere = await batchBegin(db, q.id, { fileName: 'other.txt', format: 'text' });
  await batchAppend(db, elsewhere, { utterances: SAMPLE.slice(0, 1) });
  return { p: p.id, q: q.id, done, orphan, elsewhere };
}

describe('start-up cleanup of unfinished imports', () => {
  it('rolls back every unfinished batch, reports it, and keeps finished ones', async () => {
    const db = dbTest();
    const ids = await setUp(db);
    const report = await batchesCleanUnfinished(db);
    expect(report.cleaned.map((c) => [c.batch.id, c.batch.state, c.batch.failure, c.removed.utterances, c.removed.layers])).toEqual([
      [ids.orphan, 'failed', BATCH_INTERRUPTED, 4, 4],
      [ids.elsewhere, 'failed', BATCH_INTERRUPTED, 1, 0],
    ]);
    expect(await db.utterances.count()).toBe(SAMPLE.length);
    expect((await db.batches.get(ids.done))?.state).toBe('done');
    expect((await batchesCleanUnfinished(db)).cleaned).toEqual([]);
  });

  it('limits itself to one project when asked', async () => {
    const db = dbTest();
    const ids = await setUp(db);
    const report = await batchesCleanUnfinished(db, { projectId: ids.q });
    expect(report.cleaned.map((c) => c.batch.id)).toEqual([ids.elsewhere]);
    expect((await db.batches.get(ids.orphan))?.state).toBe('importing');
  });

  it('spares an import whose Web Lock is still held by a live tab', async () => {
    const db = dbTest();
    const ids = await setUp(db);
    // A fake of LockManager.query() (Web Locks API): lists the held locks by name.
    const locks = { query: async () => ({ held: [{ name: batchLockName(ids.orphan) }], pending: [] }) };
    const report = await batchesCleanUnfinished(db, { isActive: batchActiveByLocks(locks) });
    expect(report.cleaned.map((c) => c.batch.id)).toEqual([ids.elsewhere]);
    expect((await db.batches.get(ids.orphan))?.state).toBe('importing');
    expect(await db.utterances.where('source.batchId').equals(ids.orphan).count()).toBe(SAMPLE.length);
  });

  it('skips a batch another tab finished between listing and cleaning', async () => {
    const db = dbTest();
    const ids = await setUp(db);
    const report = await batchesCleanUnfinished(db, {
      isActive: async (batch) => {
        // The other tab finishes its import just as this tab checks it.
        if (batch.id === ids.orphan) await batchFinish(db, ids.orphan, { utterances: SAMPLE.length });
        return false;
      },
    });
    expect(report.cleaned.map((c) => c.batch.id)).toEqual([ids.elsewhere]);
    expect((await db.batches.get(ids.orphan))?.state).toBe('done');
  });
});
