import { describe, expect, it } from 'vitest';
import type { ProjectSchema } from '../../src/core/backup/model';
import { spansFromTags } from '../../src/core/schemes';
import { disagreementGet, disagreementPage, disagreementStep, disagreementSummary, layersDisagreement, type Disagreement } from '../../src/db/adjudication-repo';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { LayerRow, SlotsmithDb } from '../../src/db/schema';
import { dbTest, utteranceMake } from './helpers';

const SCHEMA: ProjectSchema = { slots: [{ name: 'service' }, { name: 'day' }, { name: 'area' }], intents: [{ name: 'book_visit' }, { name: 'reschedule' }] };
const N = 40;

// ana's layer on every utterance; ben's on most, differing in a pattern of spans and intents.
function anaTags(i: number): string[] {
  return ['O', 'B-service', 'O', i % 3 === 0 ? 'I-day' : 'B-day', 'O'];
}
function benTags(i: number): string[] {
  if (i % 4 === 1) return ['O', 'B-service', 'O', 'B-day', 'I-day'];
  if (i % 7 === 2) return ['B-area', 'B-service', 'O', 'B-day', 'O'];
  return anaTags(i);
}
const benIntent = (i: number) => (i % 5 === 3 ? 'reschedule' : 'book_visit');
const benHas = (i: number) => i % 9 !== 4;

async function seed(db: SlotsmithDb) {
  const project = await projectCreate(db, { name: 'Repairs', schema: SCHEMA });
  const batchId = await batchBegin(db, project.id, { fileName: 'ana.iob', format: 'columns', annotator: 'ana' });
  const utterances = Array.from({ length: N }, (_, i) => utteranceMake(`need plumber on friday ${i}`, anaTags(i), { id: `hr-${i}`, intent: 'book_visit' }));
  const ids = (await batchAppend(db, batchId, { utterances })).utteranceIds;
  for (const [i, id] of ids.entries()) {
    if (benHas(i)) await layerSave(db, [id, 'ben'], { tags: benTags(i), intent: benIntent(i), status: 'done' }, { expectedRevision: 0, who: 'ben' });
  }
  // Another project with the same people must never leak in.
  const other = await projectCreate(db, { name: 'Other', schema: SCHEMA });
  const otherBatch = await batchBegin(db, other.id, { fileName: 'ben.iob', format: 'columns', annotator: 'ben' });
  await batchAppend(db, otherBatch, { utterances: utterances.slice(0, 5) });
  return { projectId: project.id, ids };
}

/** The reference by brute force: spans as the CoNLL-2000 reading gives them, and intents. Positions (seq) count from 1. */
function expectedSeqs(): number[] {
  const key = (tags: string[]) => JSON.stringify(spansFromTags(tags));
  return Array.from({ length: N }, (_, i) => i).filter((i) => benHas(i) && (key(anaTags(i)) !== key(benTags(i)) || benIntent(i) !== 'book_visit')).map((i) => i + 1);
}

async function allPages(db: SlotsmithDb, projectId: number, limit: number): Promise<Disagreement[]> {
  const rows: Disagreement[] = [];
  let after: number | null = null;
  for (let calls = 0; calls < 100; calls++) {
    const page = await disagreementPage(db, projectId, 'ana', 'ben', after, limit);
    expect(page.rows.length).toBeLessThanOrEqual(limit);
    rows.push(...page.rows);
    if (page.next === null) return rows;
    after = page.next;
  }
  throw new Error('paging did not end');
}

describe('layersDisagreement', () => {
  it('counts disputed regions and intent differences; a stray I-X read as B-X is agreement', () => {
    const a = { tags: ['O', 'I-day'], intent: 'book_visit' } as Pick<LayerRow, 'tags' | 'intent'>;
    expect(layersDisagreement(a, { tags: ['O', 'B-day'], intent: 'book_visit' })).toBeNull();
    expect(layersDisagreement(a, { tags: ['B-area', 'O'], intent: 'cancel' })).toEqual({ regions: 2, intentDiffers: true });
  });
});

describe('disagreement listing', () => {
  it('pages through exactly the utterances where both have layers that differ, in project order, whatever the page size', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const want = expectedSeqs();
    expect(want.length).toBeGreaterThan(10);
    for (const limit of [1, 3, 100]) {
      const rows = await allPages(db, projectId, limit);
      expect(rows.map((r) => r.seq)).toEqual(want);
    }
    const rows = await allPages(db, projectId, 100);
    const first = rows.find((r) => r.seq === 2);
    expect(first).toMatchObject({ regions: 1, intentDiffers: false, gold: null, text: 'need plumber on friday 1' });
    expect(rows.find((r) => r.seq === 4)).toMatchObject({ regions: 0, intentDiffers: true });
  });

  it('tells which already have gold, steps both ways, and can skip the resolved ones', async () => {
    const db = dbTest();
    const { projectId, ids } = await seed(db);
    const want = expectedSeqs();
    const [s0, s1, s2] = want as [number, number, number];
    await layerSave(db, [ids[s0 - 1] as number, 'gold'], { tags: benTags(s0 - 1), intent: 'book_visit', status: 'done' }, { expectedRevision: 0, who: 'lead' });
    await layerSave(db, [ids[s1 - 1] as number, 'gold'], { tags: benTags(s1 - 1), status: 'draft' }, { expectedRevision: 0, who: 'lead' });
    const rows = await allPages(db, projectId, 100);
    expect(rows.filter((r) => r.gold !== null).map((r) => [r.seq, r.gold])).toEqual([
      [s0, 'done'],
      [s1, 'draft'],
    ]);
    expect((await disagreementStep(db, projectId, 'ana', 'ben', null, 1))?.seq).toBe(s0);
    expect((await disagreementStep(db, projectId, 'ana', 'ben', null, 1, { unresolvedOnly: true }))?.seq).toBe(s1);
    expect((await disagreementStep(db, projectId, 'ana', 'ben', s1, 1))?.seq).toBe(s2);
    expect((await disagreementStep(db, projectId, 'ana', 'ben', s1, -1))?.seq).toBe(s0);
    expect(await disagreementStep(db, projectId, 'ana', 'ben', s1, -1, { unresolvedOnly: true })).toBeUndefined();
    expect((await disagreementStep(db, projectId, 'ana', 'ben', null, -1))?.seq).toBe(want[want.length - 1]);
    expect(await disagreementStep(db, projectId, 'ana', 'ben', want[want.length - 1] as number, 1)).toBeUndefined();
    expect((await disagreementGet(db, ids[s2 - 1] as number, 'ana', 'ben'))?.seq).toBe(s2);
    // An utterance where they agree is no disagreement.
    const agreeing = Array.from({ length: N }, (_, i) => i).find((i) => benHas(i) && !want.includes(i + 1)) as number;
    expect(await disagreementGet(db, ids[agreeing] as number, 'ana', 'ben')).toBeUndefined();

    expect(await disagreementSummary(db, projectId, 'ana', 'ben')).toEqual({
      shared: Array.from({ length: N }, (_, i) => i).filter(benHas).length,
      disagreeing: want.length,
      resolved: 1,
    });
  });
});

describe('disagreements across many utterance pages', () => {
  it('pages and steps through a project larger than one read', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Big', schema: SCHEMA });
    const texts = Array.from({ length: 1200 }, (_, i) => utteranceMake(`plumber on friday ${i}`, ['B-service', 'O', 'B-day', 'O'], { id: `big-${i}`, intent: 'book_visit' }));
    const ana = await batchBegin(db, project.id, { fileName: 'ana.iob', format: 'columns', annotator: 'ana' });
    await batchAppend(db, ana, { utterances: texts });
    // ben differs on every 50th utterance (the day left out).
    const benTexts = texts.map((u, i) => (i % 50 === 7 ? { ...u, tags: ['B-service', 'O', 'O', 'O'] } : u));
    const ben = await batchBegin(db, project.id, { fileName: 'ben.iob', format: 'columns', annotator: 'ben' });
    await batchAppend(db, ben, { utterances: benTexts, attach: 'external-id' });
    const want = Array.from({ length: 1200 }, (_, i) => i).filter((i) => i % 50 === 7).map((i) => i + 1);
    expect((await allPages(db, project.id, 7)).map((r) => r.seq)).toEqual(want);
    expect((await disagreementStep(db, project.id, 'ana', 'ben', null, -1))?.seq).toBe(want[want.length - 1]);
    expect((await disagreementStep(db, project.id, 'ana', 'ben', 600, -1))?.seq).toBe(558);
    expect((await disagreementStep(db, project.id, 'ana', 'ben', 10, 1))?.seq).toBe(58);
    expect(await disagreementSummary(db, project.id, 'ana', 'ben')).toEqual({ shared: 1200, disagreeing: want.length, resolved: 0 });
  });
});
