import { describe, expect, it } from 'vitest';
import { editApply, layerEditBlank, undoApplies } from '../../src/core/editing';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { labelUndoSeed } from '../../src/db/label-history';
import { labelNextUnlabelled, labelUtteranceStep } from '../../src/db/label-nav';
import { layerGet, layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { dbTest, SAMPLE, utteranceMake } from './helpers';

async function projectWith(db: SlotsmithDb, count: number): Promise<{ projectId: number; ids: number[] }> {
  const project = await projectCreate(db, { name: 'Repairs' });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
  const utterances = Array.from({ length: count }, (_, i) => utteranceMake(`call me back about job ${i} please`));
  const { utteranceIds } = await batchAppend(db, batchId, { utterances });
  return { projectId: project.id, ids: utteranceIds };
}

describe('labelUtteranceStep', () => {
  it('steps forward and back in project order and stops at both ends', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 3);
    const rows = await Promise.all(ids.map((id) => db.utterances.get(id)));
    const seqs = rows.map((r) => r?.seq as number);
    expect((await labelUtteranceStep(db, projectId, seqs[0] as number, 1))?.id).toBe(ids[1]);
    expect((await labelUtteranceStep(db, projectId, seqs[2] as number, -1))?.id).toBe(ids[1]);
    expect(await labelUtteranceStep(db, projectId, seqs[2] as number, 1)).toBeUndefined();
    expect(await labelUtteranceStep(db, projectId, seqs[0] as number, -1)).toBeUndefined();
  });

  it('never leaves the project', async () => {
    const db = dbTest();
    const a = await projectWith(db, 2);
    await projectWith(db, 2);
    const last = await db.utterances.get(a.ids[1] as number);
    expect(await labelUtteranceStep(db, a.projectId, last?.seq as number, 1)).toBeUndefined();
  });
});

describe('labelNextUnlabelled', () => {
  it('skips utterances the annotator has started, wraps round once, and ends when none is left', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 1203);
    const seqOf = async (id: number) => (await db.utterances.get(id))?.seq as number;
    // The first 1100 (across scan pages) are started by ann-a; one more layer is only 'unlabelled'.
    for (const id of ids.slice(0, 1100)) await db.layers.put({ utteranceId: id, annotator: 'ann-a', projectId, tags: [], intent: null, status: 'draft', note: '', revision: 1, updated: 0 });
    await db.layers.put({ utteranceId: ids[1100] as number, annotator: 'ann-a', projectId, tags: [], intent: null, status: 'unlabelled', note: '', revision: 1, updated: 0 });
    expect((await labelNextUnlabelled(db, projectId, 'ann-a', null))?.id).toBe(ids[1100]);
    expect((await labelNextUnlabelled(db, projectId, 'ann-a', await seqOf(ids[1100] as number)))?.id).toBe(ids[1101]);
    // After the last one, it wraps round to the first still to do.
    expect((await labelNextUnlabelled(db, projectId, 'ann-a', await seqOf(ids[1202] as number)))?.id).toBe(ids[1100]);
    // Another annotator has started nothing.
    expect((await labelNextUnlabelled(db, projectId, 'ann-b', null))?.id).toBe(ids[0]);
    for (const id of ids.slice(1100)) await db.layers.put({ utteranceId: id, annotator: 'ann-a', projectId, tags: [], intent: null, status: 'done', note: '', revision: 1, updated: 0 });
    expect(await labelNextUnlabelled(db, projectId, 'ann-a', await seqOf(ids[5] as number))).toBeUndefined();
  });
});

describe('labelUndoSeed', () => {
  it('rebuilds undo steps from the history rows of one person, oldest first, ready to undo', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
    const { utteranceIds: [first, second] } = await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 2) });
    const u1 = first as number;
    const u2 = second as number;
    const blank1 = layerEditBlank(6);
    const label1 = editApply(blank1, { kind: 'label', from: 4, to: 5, slot: 'day' });
    await layerSave(db, [u1, 'ana'], label1, { expectedRevision: 0, who: 'ana' });
    await layerSave(db, [u2, 'ben'], { status: 'done' }, { expectedRevision: 0, who: 'ben' });
    await layerSave(db, [u2, 'ana'], { intent: 'reschedule' }, { expectedRevision: 0, who: 'ana' });
    await layerSave(db, [u1, 'gold'], { intent: 'book_visit' }, { expectedRevision: 0, who: 'ana' });
    await layerSave(db, [u1, 'ana'], { status: 'done' }, { expectedRevision: 1, who: 'ana' });

    const seed = await labelUndoSeed(db, project.id, 'ana', ['ana'], 10);
    expect(seed.map((e) => [e.utteranceId, e.annotator, e.after.revision])).toEqual([
      [u1, 'ana', 1],
      [u2, 'ana', 1],
      [u1, 'ana', 2],
    ]);
    // The first step of a layer undoes to a blank, unlabelled layer.
    expect(seed[0]?.before).toEqual(blank1);
    const top = seed[2];
    const stored = await layerGet(db, [u1, 'ana']);
    expect(top !== undefined && stored !== undefined && undoApplies(top, stored)).toBe(true);
    expect((await labelUndoSeed(db, project.id, 'ana', ['ana', 'gold'], 2)).map((e) => e.annotator)).toEqual(['gold', 'ana']);
  });
});
