import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { agreementCacheOpen } from '../../src/db/agreement-cache';
import { corpusIndexBuild, corpusIndexSignature } from '../../src/db/corpus-index';
import { corpusIndexStoreOpen } from '../../src/db/corpus-index-store';
import { projectCachesForget } from '../../src/db/project-caches';
import { projectCreate, projectDelete } from '../../src/db/project-repo';
import { dbTest } from './helpers';

describe('projectCachesForget', () => {
  it('drops the table index and the agreement results of a deleted project, and only those', async () => {
    const db = dbTest();
    const factory = new IDBFactory();
    const gone = (await projectCreate(db, { name: 'Boiler jobs' })).id;
    const kept = (await projectCreate(db, { name: 'Gutter jobs' })).id;
    const store = corpusIndexStoreOpen(factory);
    const results = agreementCacheOpen<string>(factory);
    const signatures = new Map<number, Awaited<ReturnType<typeof corpusIndexSignature>>>();
    for (const id of [gone, kept]) {
      await store.save(await corpusIndexBuild(db, id));
      signatures.set(id, await corpusIndexSignature(db, id));
      for (const key of ['a', 'b']) await results.save(id, key, signatures.get(id)!, `figures ${id} ${key}`);
    }
    expect(await store.load(gone)).toBeDefined();
    await projectDelete(db, gone);
    await projectCachesForget(factory, gone);
    expect(await store.load(gone)).toBeUndefined();
    expect(await results.load(gone, 'a', signatures.get(gone)!)).toBeUndefined();
    expect(await results.load(gone, 'b', signatures.get(gone)!)).toBeUndefined();
    expect((await store.load(kept))?.projectId).toBe(kept);
    expect((await results.load(kept, 'b', signatures.get(kept)!))?.result).toBe(`figures ${kept} b`);
  });
});
