/**
 * The gap between adding an import's batch row and taking the batch's Web Lock: another tab's
 * start-up cleanup must not roll back an import caught in it.
 */
import { describe, expect, it } from 'vitest';
import { BATCH_BEGIN_LOCK, batchActiveByLocks, batchesCleanUnfinished, batchLockName } from '../../src/db/batch-cleanup';
import { projectCreate } from '../../src/db/project-repo';
import { BatchStateError } from '../../src/db/errors';
import { importCommit } from '../../src/workers/import-run';
import { dbTest } from './helpers';

/**
 * An in-memory stand-in for navigator.locks (Web Locks API, exclusive mode only): a lock is granted
 * when no one holds it, waiters are served first come first served, `query` lists held names.
 */
function lockManager() {
  const held = new Set<string>();
  const waiting = new Map<string, (() => void)[]>();
  const acquire = (name: string) =>
    new Promise<void>((resolve) => {
      if (!held.has(name)) {
        held.add(name);
        resolve();
      } else waiting.set(name, [...(waiting.get(name) ?? []), resolve]);
    });
  const release = (name: string) => {
    const next = waiting.get(name)?.shift();
    if (next === undefined) held.delete(name);
    else next();
  };
  return {
    held,
    async request<T>(name: string, work: () => Promise<T>): Promise<T> {
      await acquire(name);
      try {
        return await work();
      } finally {
        release(name);
      }
    },
    async query() {
      return { held: [...held].map((name) => ({ name })), pending: [] };
    },
  };
}

/** Lets the importer run up to the batch lock, then holds it there until `open()`. */
function gate() {
  let open: () => void = () => {};
  const opened = new Promise<void>((resolve) => (open = resolve));
  let reached: () => void = () => {};
  const atGap = new Promise<void>((resolve) => (reached = resolve));
  return { open, opened, atGap, reached };
}

const later = (ms: number) => new Promise<false>((resolve) => setTimeout(() => resolve(false), ms));

function visits(count: number): Blob {
  let out = '';
  for (let i = 0; i < count; i++) out += `# id = v-${i}\n# intent = book_visit\nplumber\tB-service\non\tO\nday${i}\tB-day\n\n`;
  return new Blob([out]);
}

/**
 * `waitMs`: how long the cleanup may take while the gate is shut. A cleanup that waits for a lock
 * never finishes in it; one that does not finishes as soon as it can, so a busy machine cannot flip
 * the outcome (only a long wait would make the first case slow, never wrong).
 */
async function gapRun(cleanupLocks: (locks: ReturnType<typeof lockManager>) => Parameters<typeof batchActiveByLocks>[0], waitMs: number) {
  const db = dbTest();
  const projectId = (await projectCreate(db, { name: 'Repairs' })).id;
  const locks = lockManager();
  const g = gate();
  // The importer's lock: the batch's own lock waits at the gate, as a busy tab might between the two steps.
  const lock = async <T>(name: string, work: () => Promise<T>): Promise<T> => {
    if (name.startsWith('slotsmith-import-') && name !== BATCH_BEGIN_LOCK) {
      g.reached();
      await g.opened;
    }
    return locks.request(name, work);
  };
  const request = { projectId, format: 'columns' as const, fileName: 'visits.iob2', annotator: 'ana', total: 30 };
  const importing = importCommit(db, visits(30), request, { lock });
  importing.catch(() => undefined);
  await g.atGap;
  const [batch] = await db.batches.where('state').equals('importing').toArray();
  expect(batch?.fileName).toBe('visits.iob2');
  expect(locks.held.has(batchLockName(batch?.id ?? -1))).toBe(false);
  const cleanup = batchesCleanUnfinished(db, { isActive: batchActiveByLocks(cleanupLocks(locks)) });
  const doneInGap = await Promise.race([cleanup.then(() => true as const), later(waitMs)]);
  g.open();
  return { db, importing, cleanup, doneInGap };
}

describe('import start and start-up cleanup', () => {
  it('a cleanup that runs while an import has its row but not yet its lock waits, then spares the import', async () => {
    const { db, importing, cleanup, doneInGap } = await gapRun((locks) => locks, 300);
    expect(doneInGap).toBe(false);
    expect((await cleanup).cleaned).toEqual([]);
    const summary = await importing;
    expect(summary.utterances).toBe(30);
    expect(await db.utterances.count()).toBe(30);
    expect((await db.batches.get(summary.batchId))?.state).toBe('done');
  });

  it('without the begin lock (lock query only) the same cleanup rolls the live import back: the gap the begin lock closes', async () => {
    const { db, importing, cleanup, doneInGap } = await gapRun((locks) => ({ query: locks.query }), 30_000);
    expect(doneInGap).toBe(true);
    expect((await cleanup).cleaned.map((c) => c.batch.fileName)).toEqual(['visits.iob2']);
    await expect(importing).rejects.toBeInstanceOf(BatchStateError);
    expect(await db.utterances.count()).toBe(0);
  });

  it('the begin lock is held from before the batch row exists until the batch lock is granted, then let go', async () => {
    const db = dbTest();
    const projectId = (await projectCreate(db, { name: 'Repairs' })).id;
    const locks = lockManager();
    const seen: string[] = [];
    const lock = async <T>(name: string, work: () => Promise<T>): Promise<T> =>
      locks.request(name, async () => {
        seen.push(`${name}: rows ${await db.batches.count()}, held ${[...locks.held].sort().join(' + ')}`);
        return work();
      });
    const summary = await importCommit(db, visits(3), { projectId, format: 'columns', fileName: 'v.iob2', annotator: 'ana', total: 3 }, { lock });
    expect(seen).toEqual([
      `${BATCH_BEGIN_LOCK}: rows 0, held ${BATCH_BEGIN_LOCK}`,
      `${batchLockName(summary.batchId)}: rows 1, held ${[BATCH_BEGIN_LOCK, batchLockName(summary.batchId)].sort().join(' + ')}`,
    ]);
    expect(locks.held.size).toBe(0);
  });
});
