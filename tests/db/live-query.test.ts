// Dexie's liveQuery only runs when a global indexedDB exists (it checks its DOM dependencies), as
// in every browser; the databases below still use their own injected factory.
import 'fake-indexeddb/auto';
import { liveQuery } from 'dexie';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { layerGet, layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { LayerKey, SlotsmithDb } from '../../src/db/schema';
import { dbTest, SAMPLE } from './helpers';

async function utterancesStored(db: SlotsmithDb, annotator: string): Promise<number[]> {
  const project = await projectCreate(db, { name: 'Repairs' });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.iob', format: 'columns', annotator });
  return (await batchAppend(db, batchId, { utterances: SAMPLE })).utteranceIds;
}

describe('live queries', () => {
  it('refreshes a live query in another tab after a save', async () => {
    const factory = new IDBFactory();
    const tabA = dbTest({ factory, name: 'live' });
    const tabB = dbTest({ factory, name: 'live' });
    const [id] = await utterancesStored(tabA, 'ana');
    const key: LayerKey = [id as number, 'ana'];
    const seen: (string | undefined)[] = [];
    const waiters: { status: string; resolve: () => void }[] = [];
    const statusSeen = (status: string) => new Promise<void>((resolve) => waiters.push({ status, resolve }));
    const firstValue = statusSeen('done');
    const flagged = statusSeen('flagged');
    const subscription = liveQuery(() => layerGet(tabB, key)).subscribe((layer) => {
      seen.push(layer?.status);
      for (const w of waiters) if (w.status === layer?.status) w.resolve();
    });
    await firstValue;
    await layerSave(tabA, key, { status: 'flagged' }, { expectedRevision: 1, who: 'ana' });
    await flagged;
    subscription.unsubscribe();
    expect(seen).toEqual(['done', 'flagged']);
  });
});
