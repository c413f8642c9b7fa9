// Dexie's liveQuery only runs when a global indexedDB exists (it checks its DOM dependencies), as
// in every browser; the database below still uses its own injected factory.
import 'fake-indexeddb/auto';
import { liveQuery } from 'dexie';
import { describe, expect, it } from 'vitest';
import { disagreementSet, goldDoneIds, summaryFrom, type DisagreementSet } from '../../src/db/adjudication-repo';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import { dbTest, utteranceMake } from './helpers';

const settle = () => new Promise((r) => setTimeout(r, 150));

describe('resolver progress watched in two parts', () => {
  it('a gold save re-reads only gold’s keys; a change to B compares the layers again', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs', schema: { slots: [{ name: 'service' }, { name: 'day' }], intents: [{ name: 'book_visit' }] } });
    const batchId = await batchBegin(db, project.id, { fileName: 'ana.iob', format: 'columns', annotator: 'ana' });
    const utterances = Array.from({ length: 6 }, (_, i) => utteranceMake(`plumber on friday ${i}`, ['B-service', 'O', 'B-day', 'O'], { id: `hr-${i}`, intent: 'book_visit' }));
    const ids = (await batchAppend(db, batchId, { utterances })).utteranceIds;
    // ben disagrees on utterances 1 and 4 (no day there), agrees elsewhere.
    for (const [i, id] of ids.entries()) {
      const tags = i === 1 || i === 4 ? ['B-service', 'O', 'O', 'O'] : ['B-service', 'O', 'B-day', 'O'];
      await layerSave(db, [id, 'ben'], { tags, intent: 'book_visit', status: 'done' }, { expectedRevision: 0, who: 'ben' });
    }
    const sets: DisagreementSet[] = [];
    const golds: Int32Array[] = [];
    const a = liveQuery(() => disagreementSet(db, project.id, 'ana', 'ben')).subscribe((v) => sets.push(v));
    const g = liveQuery(() => goldDoneIds(db, project.id)).subscribe((v) => golds.push(v));
    await settle();
    expect(sets).toHaveLength(1);
    expect([...(sets[0]?.disagreeing ?? [])]).toEqual([ids[1], ids[4]]);
    expect(summaryFrom(sets[0]!, golds[0]!)).toEqual({ shared: 6, disagreeing: 2, resolved: 0 });

    await layerSave(db, [ids[4] as number, 'gold'], { tags: ['B-service', 'O', 'B-day', 'O'], intent: 'book_visit', status: 'done' }, { expectedRevision: 0, who: 'rosa' });
    await settle();
    expect(golds.length).toBeGreaterThanOrEqual(2);
    expect(sets).toHaveLength(1);
    expect(summaryFrom(sets[0]!, golds.at(-1)!)).toEqual({ shared: 6, disagreeing: 2, resolved: 1 });

    // ben now agrees on utterance 1: the comparison runs again.
    const row = await db.layers.get([ids[1] as number, 'ben']);
    await layerSave(db, [ids[1] as number, 'ben'], { tags: ['B-service', 'O', 'B-day', 'O'] }, { expectedRevision: row?.revision ?? 0, who: 'ben' });
    await settle();
    expect(sets.length).toBeGreaterThanOrEqual(2);
    expect(summaryFrom(sets.at(-1)!, golds.at(-1)!)).toEqual({ shared: 6, disagreeing: 1, resolved: 1 });
    a.unsubscribe();
    g.unsubscribe();
  });

  it('summaryFrom counts the disagreeing ids with a done gold layer (merge of two ascending lists)', () => {
    const set = { shared: 10, disagreeing: Int32Array.from([2, 5, 7, 9]) };
    expect(summaryFrom(set, Int32Array.from([1, 5, 6, 9, 12]))).toEqual({ shared: 10, disagreeing: 4, resolved: 2 });
    expect(summaryFrom(set, new Int32Array(0))).toEqual({ shared: 10, disagreeing: 4, resolved: 0 });
    expect(summaryFrom({ shared: 0, disagreeing: new Int32Array(0) }, Int32Array.from([3]))).toEqual({ shared: 0, disagreeing: 0, resolved: 0 });
  });
});
