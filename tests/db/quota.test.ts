import Dexie from 'dexie';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { StorageFullError, storageErrorIsQuota, storageErrorMap } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectRename } from '../../src/db/project-repo';
import { dbDump } from './dump';
import { dbTest, SAMPLE } from './helpers';
import { quotaFake, type QuotaFake } from './quota-fake';

let quota: QuotaFake;
beforeEach(async () => {
  quota = await quotaFake();
});
afterEach(() => {
  quota.restore();
});

describe('a full disk', () => {
  it('fails an import chunk part-way with StorageFullError and stores nothing of it', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, project.id, { fileName: 'a.iob', format: 'columns', annotator: 'ana' });
    await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 2) });
    const before = await dbDump(db);
    // Utterances go in first: the failure hits after two of the chunk's utterances were stored.
    quota.failAfter(2);
    const error = await batchAppend(db, batchId, { utterances: SAMPLE }).catch((e: unknown) => e);
    quota.failAfter(Infinity);
    expect(error).toBeInstanceOf(StorageFullError);
    expect((error as Error).message).toMatch(/no room left/);
    expect((error as Error).message).toMatch(/Nothing from this change was saved/);
    expect(await dbDump(db)).toEqual(before);
  });

  it('fails when the layers of a chunk no longer fit, leaving its utterances out too', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, project.id, { fileName: 'a.iob', format: 'columns', annotator: 'ana' });
    const before = await dbDump(db);
    quota.failAfter(SAMPLE.length + 1);
    await expect(batchAppend(db, batchId, { utterances: SAMPLE })).rejects.toBeInstanceOf(StorageFullError);
    quota.failAfter(Infinity);
    expect(await dbDump(db)).toEqual(before);
  });

  it('fails a label edit, leaving layer and history as they were', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, project.id, { fileName: 'a.iob', format: 'columns', annotator: 'ana' });
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE });
    const key: [number, string] = [utteranceIds[0] as number, 'ana'];
    const before = await dbDump(db);
    // The layer put succeeds, the history row in the same transaction does not.
    quota.failAfter(1);
    await expect(layerSave(db, key, { status: 'flagged' }, { expectedRevision: 1, who: 'ana' })).rejects.toBeInstanceOf(StorageFullError);
    quota.failAfter(0);
    await expect(projectRename(db, project.id, 'Other')).rejects.toBeInstanceOf(StorageFullError);
    quota.failAfter(Infinity);
    expect(await dbDump(db)).toEqual(before);
    // And the database still works once there is room again.
    expect((await layerSave(db, key, { status: 'flagged' }, { expectedRevision: 1, who: 'ana' })).revision).toBe(2);
  });

  it('recognises quota errors in the forms Dexie wraps them in', () => {
    const dom = new DOMException('full', 'QuotaExceededError');
    expect(storageErrorIsQuota(dom)).toBe(true);
    expect(storageErrorIsQuota(new Dexie.QuotaExceededError('full', dom))).toBe(true);
    // A quota failure at commit time arrives as a transaction abort whose error is the quota error.
    expect(storageErrorIsQuota(new Dexie.AbortError('aborted', dom))).toBe(true);
    expect(storageErrorIsQuota(new Dexie.BulkError('2 of 5 failed', { 3: dom }))).toBe(true);
    expect(storageErrorIsQuota(new Dexie.ConstraintError('key exists'))).toBe(false);
    expect(storageErrorIsQuota(new Error('QuotaExceededError'))).toBe(false);
    const other = new Dexie.ConstraintError('key exists');
    expect(storageErrorMap(other)).toBe(other);
    expect(storageErrorMap(dom)).toBeInstanceOf(StorageFullError);
  });
});
