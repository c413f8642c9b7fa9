import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { InvalidInputError, RecordMissingError, RevisionConflictError } from '../../src/db/errors';
import { layerGet, layerHistory, layerSave, layersOf } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { LayerKey, SlotsmithDb } from '../../src/db/schema';
import { dbDump } from './dump';
import { dbTest, SAMPLE } from './helpers';

async function utterancesStored(db: SlotsmithDb, annotator?: string): Promise<number[]> {
  const project = await projectCreate(db, { name: 'Repairs' });
  const meta = annotator === undefined ? { fileName: 'a.txt', format: 'text' } : { fileName: 'a.iob', format: 'columns', annotator };
  const batchId = await batchBegin(db, project.id, meta);
  return (await batchAppend(db, batchId, { utterances: SAMPLE })).utteranceIds;
}

describe('layer edits', () => {
  it('creates a layer at revision 1 with a history row, then moves on revision by revision', async () => {
    const db = dbTest();
    const [id] = await utterancesStored(db);
    const key: LayerKey = [id as number, 'ana'];
    const created = await layerSave(db, key, { tags: ['O', 'O', 'B-service', 'O', 'B-day', 'I-day'] }, { expectedRevision: 0, who: 'ana' });
    expect(created).toMatchObject({ revision: 1, status: 'draft', intent: null, note: '', projectId: 1 });
    const next = await layerSave(db, key, { intent: 'book_visit', status: 'done', note: 'checked' }, { expectedRevision: 1, who: 'ana' });
    expect(next).toMatchObject({ revision: 2, status: 'done', intent: 'book_visit', note: 'checked', tags: created.tags });
    expect(await layerGet(db, key)).toEqual(next);
    const history = await layerHistory(db, key);
    expect(history.map((h) => [h.before?.revision ?? null, h.after.revision, h.who])).toEqual([
      [1, 2, 'ana'],
      [null, 1, 'ana'],
    ]);
    expect(history[0]?.before).toMatchObject({ status: 'draft', intent: null });
    expect(history[0]?.after).toMatchObject({ status: 'done', intent: 'book_visit' });
    expect(history[0]?.when).toBe(next.updated);
    // Creating a person's layer registers the person; gold has no annotator row.
    expect(await db.annotators.get([1, 'ana'])).toBeDefined();
    await layerSave(db, [id as number, 'gold'], { status: 'done' }, { expectedRevision: 0, who: 'ana' });
    expect(await db.annotators.get([1, 'gold'])).toBeUndefined();
  });

  it('writes nothing for an edit that changes nothing', async () => {
    const db = dbTest();
    const [id] = await utterancesStored(db, 'ana');
    const key: LayerKey = [id as number, 'ana'];
    const stored = await layerGet(db, key);
    expect(await layerSave(db, key, { status: 'done' }, { expectedRevision: 1, who: 'ana' })).toEqual(stored);
    expect(await db.history.count()).toBe(0);
  });

  it('refuses a stale write from a second tab, attaching the stored layer and changing nothing', async () => {
    const factory = new IDBFactory();
    const tabA = dbTest({ factory, name: 'shared' });
    const tabB = dbTest({ factory, name: 'shared' });
    const [id] = await utterancesStored(tabA, 'ana');
    const key: LayerKey = [id as number, 'ana'];
    // Both tabs read revision 1; A saves first.
    expect((await layerGet(tabB, key))?.revision).toBe(1);
    const saved = await layerSave(tabA, key, { status: 'flagged', note: 'price unclear' }, { expectedRevision: 1, who: 'ana' });
    const before = await dbDump(tabB);
    const error = await layerSave(tabB, key, { status: 'skipped' }, { expectedRevision: 1, who: 'ana' }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(RevisionConflictError);
    const conflict = error as RevisionConflictError;
    expect(conflict.stored).toEqual(saved);
    expect(conflict.key).toEqual(key);
    expect(conflict.expectedRevision).toBe(1);
    expect(conflict.message).toMatch(/revision 1, the stored one is revision 2\. Nothing was overwritten/);
    expect(await dbDump(tabB)).toEqual(before);
    // B retries on the stored revision and wins.
    expect((await layerSave(tabB, key, { status: 'skipped' }, { expectedRevision: 2, who: 'ana' })).revision).toBe(3);
    expect((await layerGet(tabA, key))?.status).toBe('skipped');
  });

  it('reports a conflict when a layer appeared since the edit began (expected 0)', async () => {
    const db = dbTest();
    const [id] = await utterancesStored(db, 'ana');
    const error = await layerSave(db, [id as number, 'ana'], { status: 'draft' }, { expectedRevision: 0, who: 'ana' }).catch((e: unknown) => e);
    expect((error as RevisionConflictError).stored?.revision).toBe(1);
  });

  it('refuses tags that do not fit the tokens, unknown statuses and missing utterances', async () => {
    const db = dbTest();
    const [id] = await utterancesStored(db);
    const key: LayerKey = [id as number, 'ana'];
    await expect(layerSave(db, key, { tags: ['O'] }, { expectedRevision: 0, who: 'ana' })).rejects.toBeInstanceOf(InvalidInputError);
    await expect(layerSave(db, key, { status: 'finished' as never }, { expectedRevision: 0, who: 'ana' })).rejects.toBeInstanceOf(InvalidInputError);
    await expect(layerSave(db, [999, 'ana'], { status: 'done' }, { expectedRevision: 0, who: 'ana' })).rejects.toBeInstanceOf(RecordMissingError);
    expect(await db.layers.count()).toBe(0);
  });

  it('reads one annotator layers for a page of utterances', async () => {
    const db = dbTest();
    const ids = await utterancesStored(db, 'ana');
    const got = await layersOf(db, [...ids, 999], 'ana');
    expect(got.map((l) => l?.tags)).toEqual([...SAMPLE.map((u) => u.tags), undefined]);
  });
});
