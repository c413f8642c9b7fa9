import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { agreementCacheOpen } from '../../src/db/agreement-cache';
import { bootstrapStoreOpen } from '../../src/db/bootstrap-store';
import { LayerCopyBuilder } from '../../src/db/layer-copy';
import { layerCopyStoreOpen } from '../../src/db/layer-copy-store';
import { corpusIndexBuild, corpusIndexSignature } from '../../src/db/corpus-index';
import { corpusIndexStoreOpen } from '../../src/db/corpus-index-store';
import { projectCachesForget } from '../../src/db/project-caches';
import { projectCreate, projectDelete } from '../../src/db/project-repo';
import { dbTest } from './helpers';

describe('projectCachesForget', () => {
  it('drops the table index, the agreement results, bootstrap totals and layer copies of a deleted project, and only those', async () => {
    const db = dbTest();
    const factory = new IDBFactory();
    const gone = (await projectCreate(db, { name: 'Boiler jobs' })).id;
    const kept = (await projectCreate(db, { name: 'Gutter jobs' })).id;
    const store = corpusIndexStoreOpen(factory);
    const results = agreementCacheOpen<string>(factory);
    const copies = layerCopyStoreOpen(factory);
    const totals = bootstrapStoreOpen(factory);
    const boot = { rows: { patternOf: new Int32Array(0), rowStart: new Int32Array(1), index: new Int32Array(0), value: new Int32Array(0) }, layout: { tags: 1, intents: 0, tagA: 0, tagShift: 0, intentA: 0, intentShift: 0, width: 1 }, seed: 1, totals: new Float64Array(3) };
    const signatures = new Map<number, Awaited<ReturnType<typeof corpusIndexSignature>>>();
    for (const id of [gone, kept]) {
      await store.save(await corpusIndexBuild(db, id));
      signatures.set(id, await corpusIndexSignature(db, id));
      for (const key of ['a', 'b']) await results.save(id, key, signatures.get(id)!, `figures ${id} ${key}`);
      await copies.save([new LayerCopyBuilder(id, 'ann-a').done(signatures.get(id)!)]);
      await totals.save(id, 'a', boot);
    }
    expect((await copies.load(gone, ['ann-a'])).size).toBe(1);
    expect(await totals.load(gone, 'a')).toBeDefined();
    expect(await store.load(gone)).toBeDefined();
    await projectDelete(db, gone);
    await projectCachesForget(factory, gone);
    expect(await store.load(gone)).toBeUndefined();
    expect(await results.load(gone, 'a', signatures.get(gone)!)).toBeUndefined();
    expect(await results.load(gone, 'b', signatures.get(gone)!)).toBeUndefined();
    expect((await copies.load(gone, ['ann-a'])).size).toBe(0);
    expect(await totals.load(gone, 'a')).toBeUndefined();
    expect((await copies.load(kept, ['ann-a'])).get('ann-a')?.projectId).toBe(kept);
    expect((await totals.load(kept, 'a'))?.seed).toBe(1);
    expect((await store.load(kept))?.projectId).toBe(kept);
    expect((await results.load(kept, 'b', signatures.get(kept)!))?.result).toBe(`figures ${kept} b`);
  });
});
