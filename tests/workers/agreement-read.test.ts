import { describe, expect, it } from 'vitest';
import type { LayerRow } from '../../src/db/schema';
import { layerStatusCounts, layerStatusesPresent, layersScan, layerUtteranceSpan } from '../../src/workers/agreement-read';
import { dbTest, SAMPLE } from '../db/helpers';
import { agreementSeed } from './agreement-seed';

// Several projects in one database, so pages of one project's ids must never pick up another's rows.
async function twoProjects() {
  const db = dbTest();
  const many = Array.from({ length: 30 }, (_, i) => ({ ...(SAMPLE[i % SAMPLE.length] as (typeof SAMPLE)[number]), id: `hr-${i + 1}` }));
  const first = await agreementSeed(db, [
    { annotator: 'ann-a', utterances: many, statusOf: (_, i) => (i % 3 === 0 ? 'draft' : 'done') },
    { annotator: 'ann-b', utterances: many.filter((_, i) => i % 2 === 0) },
    { annotator: 'gold', utterances: many.slice(0, 5) },
  ]);
  const second = await agreementSeed(db, [{ annotator: 'ann-a', utterances: many.slice(0, 10) }], 'Roof leaks');
  return { db, first, second, many };
}

describe('layersScan', () => {
  it('visits exactly the chosen layers, in utterance order, whatever the page size', async () => {
    const { db, first } = await twoProjects();
    const choice = { projectId: first.projectId, annotators: ['ann-a', 'ann-b'], statuses: ['done' as const] };
    const all = await db.layers.toArray();
    const want = all
      .filter((r) => r.projectId === first.projectId && choice.annotators.includes(r.annotator) && r.status === 'done')
      .sort((x, y) => x.utteranceId - y.utteranceId || (x.annotator < y.annotator ? -1 : 1));
    for (const pageSize of [1, 4, 7, 1000]) {
      const seen: LayerRow[] = [];
      const progress: string[] = [];
      const counts = await layersScan(db, choice, (row) => seen.push(row), (p) => progress.push(`${p.done}/${p.total}`), pageSize);
      expect(seen).toEqual(want);
      expect(counts.layers).toBe(want.length);
      expect(counts.utterances).toBe(new Set(want.map((r) => r.utteranceId)).size);
      // Progress runs over the span of utterance ids, from the first chosen to the last.
      const ids = want.map((r) => r.utteranceId);
      const span = Math.max(...ids) - Math.min(...ids) + 1;
      expect(progress[0]).toBe(`0/${span}`);
      expect(progress.at(-1)).toBe(`${span}/${span}`);
    }
  });

  it('reads every layer of the project when nothing is narrowed', async () => {
    const { db, first, second } = await twoProjects();
    const seen: LayerRow[] = [];
    await layersScan(db, { projectId: first.projectId, annotators: null, statuses: null }, (row) => seen.push(row), undefined, 3);
    expect(seen.length).toBe(30 + 15 + 5);
    expect(seen.every((r) => r.projectId === first.projectId)).toBe(true);
    const ids = [...second.idOf.values()];
    expect(await layerUtteranceSpan(db, { projectId: second.projectId, annotators: null, statuses: null })).toEqual({ first: Math.min(...ids), last: Math.max(...ids) });
    // ann-b holds every second utterance of the first project; gold the first five.
    const firstIds = [...first.idOf.values()];
    expect(await layerUtteranceSpan(db, { projectId: first.projectId, annotators: ['ann-b'], statuses: ['done'] })).toEqual({ first: firstIds[0], last: firstIds[28] });
    expect(await layerUtteranceSpan(db, { projectId: first.projectId, annotators: ['gold'], statuses: null })).toEqual({ first: firstIds[0], last: firstIds[4] });
    expect(await layerUtteranceSpan(db, { projectId: first.projectId, annotators: ['ann-b'], statuses: ['draft'] })).toBeNull();
  });

  it('counts layers per annotator and status from the index', async () => {
    const { db, first } = await twoProjects();
    expect(await layerStatusCounts(db, first.projectId)).toEqual({ 'ann-a': { done: 20, draft: 10 }, 'ann-b': { done: 15 }, gold: { done: 5 } });
    expect(await layerStatusesPresent(db, first.projectId)).toEqual({ 'ann-a': { done: 1, draft: 1 }, 'ann-b': { done: 1 }, gold: { done: 1 } });
  });
});
