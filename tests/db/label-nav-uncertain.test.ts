import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { labelNextUncertain, labelNextUnlabelled, labelUncertainOrder } from '../../src/db/label-nav';
import { leastConfidenceNote } from '../../src/db/model-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { LayerStatus } from '../../src/core/backup/model';
import type { SlotsmithDb, UtteranceRow } from '../../src/db/schema';
import { dbTest, utteranceMake } from './helpers';

async function projectWith(db: SlotsmithDb, count: number): Promise<{ projectId: number; ids: number[] }> {
  const project = await projectCreate(db, { name: 'Repairs' });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
  const utterances = Array.from({ length: count }, (_, i) => utteranceMake(`is the roofer coming for job ${i}`));
  const { utteranceIds } = await batchAppend(db, batchId, { utterances });
  return { projectId: project.id, ids: utteranceIds };
}

function layerPut(db: SlotsmithDb, projectId: number, utteranceId: number, annotator: string, status: LayerStatus, note = '') {
  return db.layers.put({ utteranceId, annotator, projectId, tags: ['O', 'O', 'O', 'O', 'O', 'O', 'O'], intent: null, status, note, revision: 1, updated: 0 });
}

/** Many layers in one write, so the large cases stay quick. */
function layersPut(db: SlotsmithDb, projectId: number, ids: readonly number[], annotator: string, status: LayerStatus, note: (i: number) => string = () => '') {
  return db.layers.bulkPut(ids.map((utteranceId, i) => ({ utteranceId, annotator, projectId, tags: ['O', 'O', 'O', 'O', 'O', 'O', 'O'], intent: null, status, note: note(i), revision: 1, updated: 0 })));
}

const row = (db: SlotsmithDb, id: number) => db.utterances.get(id) as Promise<UtteranceRow>;

/** Where repeated "next not started" goes from `start`, for `steps` steps (no labelling in between). */
async function walk(db: SlotsmithDb, projectId: number, annotator: string, start: UtteranceRow | null, steps: number): Promise<number[]> {
  const order = await labelUncertainOrder(db, projectId);
  const seen: number[] = [];
  let at = start;
  for (let i = 0; i < steps; i++) {
    const next = await labelNextUncertain(db, projectId, annotator, order, at);
    if (next === undefined) break;
    seen.push(next.id);
    at = next;
  }
  return seen;
}

describe('labelUncertainOrder', () => {
  it('orders model layers by their stored least confidence, least sure first, ties by id; unreadable notes left out', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 6);
    const [u0, u1, u2, u3, u4] = ids as [number, number, number, number, number];
    await layerPut(db, projectId, u0, 'model', 'draft', leastConfidenceNote(0.12));
    await layerPut(db, projectId, u1, 'model', 'draft', leastConfidenceNote(0.87));
    await layerPut(db, projectId, u2, 'model', 'draft', leastConfidenceNote(0.5));
    await layerPut(db, projectId, u3, 'model', 'draft', leastConfidenceNote(0.87));
    await layerPut(db, projectId, u4, 'model', 'draft', 'not a number');
    // A person's layer with a numeric note is not a model score.
    await layerPut(db, projectId, u4, 'ann-a', 'draft', '0.99');
    const order = await labelUncertainOrder(db, projectId);
    expect(order.ids).toEqual([u1, u3, u2, u0]);
    expect(order.scores.get(u1)).toBe(0.87);
    expect(order.at.get(u2)).toBe(2);
    // Another project's model layers stay out.
    const other = await projectWith(db, 1);
    await layerPut(db, other.projectId, other.ids[0] as number, 'model', 'draft', '0.99');
    expect((await labelUncertainOrder(db, projectId)).ids).toEqual([u1, u3, u2, u0]);
  });
});

describe('labelNextUncertain', () => {
  it('goes through the pre-labelled utterances least sure first, then the rest in project order, and wraps round', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 6);
    const [u0, u1, u2, u3, u4, u5] = ids as [number, number, number, number, number, number];
    await layerPut(db, projectId, u4, 'model', 'draft', '0.3');
    await layerPut(db, projectId, u1, 'model', 'draft', '0.9');
    // From the top: the least sure first, then the rest in project order.
    expect(await walk(db, projectId, 'ann-c', null, 3)).toEqual([u1, u4, u0]);
    const order = await labelUncertainOrder(db, projectId);
    // From an utterance outside the model's list: the least sure not started comes first.
    expect((await labelNextUncertain(db, projectId, 'ann-c', order, await row(db, u3)))?.id).toBe(u1);
    // Down the model's list, then the rest from the start.
    expect((await labelNextUncertain(db, projectId, 'ann-c', order, await row(db, u1)))?.id).toBe(u4);
    expect((await labelNextUncertain(db, projectId, 'ann-c', order, await row(db, u4)))?.id).toBe(u0);
    // Once the model's utterances are started, the rest go on in project order and wrap round.
    await layerPut(db, projectId, u1, 'ann-c', 'done');
    await layerPut(db, projectId, u4, 'ann-c', 'draft');
    expect(await walk(db, projectId, 'ann-c', await row(db, u2), 5)).toEqual([u3, u5, u0, u2, u3]);
  });

  it('skips what the labeller started (any status but unlabelled) and ends when nothing is left', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 4);
    const [u0, u1, u2, u3] = ids as [number, number, number, number];
    await layerPut(db, projectId, u2, 'model', 'draft', '0.8');
    await layerPut(db, projectId, u3, 'model', 'draft', '0.6');
    await layerPut(db, projectId, u2, 'ann-c', 'done');
    await layerPut(db, projectId, u0, 'ann-c', 'skipped');
    await layerPut(db, projectId, u1, 'ann-c', 'unlabelled');
    const order = await labelUncertainOrder(db, projectId);
    expect((await labelNextUncertain(db, projectId, 'ann-c', order, null))?.id).toBe(u3);
    expect((await labelNextUncertain(db, projectId, 'ann-c', order, await row(db, u3)))?.id).toBe(u1);
    // Another labeller has started nothing: the model's least sure comes first for them.
    expect((await labelNextUncertain(db, projectId, 'ann-d', order, null))?.id).toBe(u2);
    await layerPut(db, projectId, u1, 'ann-c', 'draft');
    await layerPut(db, projectId, u3, 'ann-c', 'flagged');
    expect(await labelNextUncertain(db, projectId, 'ann-c', order, await row(db, u3))).toBeUndefined();
  });

  it('without any model layer it is the corpus order of labelNextUnlabelled, across scan pages', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 1203);
    await layersPut(db, projectId, ids.slice(0, 1100), 'ann-a', 'draft');
    const order = await labelUncertainOrder(db, projectId);
    expect(order.ids).toEqual([]);
    for (const from of [null, ids[3], ids[1100], ids[1202]] as (number | undefined)[]) {
      const current = from === null || from === undefined ? null : await row(db, from);
      const mine = await labelNextUncertain(db, projectId, 'ann-a', order, current);
      const plain = await labelNextUnlabelled(db, projectId, 'ann-a', current?.seq ?? null);
      expect(mine?.id).toBe(plain?.id);
    }
    expect((await labelNextUncertain(db, projectId, 'ann-a', order, await row(db, ids[1202] as number)))?.id).toBe(ids[1100]);
  });

  it('a long model list (over one scan page) is read page by page', async () => {
    const db = dbTest();
    const { projectId, ids } = await projectWith(db, 1300);
    // Scores fall with position, so the order is the project order; the first 1200 are started.
    await layersPut(db, projectId, ids, 'model', 'draft', (i) => String(1 - i / 2000));
    await layersPut(db, projectId, ids.slice(0, 1200), 'ann-a', 'done');
    const order = await labelUncertainOrder(db, projectId);
    expect(order.ids).toEqual(ids);
    expect((await labelNextUncertain(db, projectId, 'ann-a', order, null))?.id).toBe(ids[1200]);
  });
});
