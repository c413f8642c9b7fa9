import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin, batchRollback } from '../../src/db/batch-repo';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import { projectCounts, utteranceCount, utteranceGet, utterancePage } from '../../src/db/utterance-repo';
import { dbTest, utteranceMake } from './helpers';

const many = (n: number, from = 0) => Array.from({ length: n }, (_, i) => utteranceMake(`book visit number ${from + i}`));

describe('utterance reads', () => {
  it('pages by seq across chunks and projects, without gaps or repeats', async () => {
    const db = dbTest();
    const a = await projectCreate(db, { name: 'A' });
    const b = await projectCreate(db, { name: 'B' });
    const batchA = await batchBegin(db, a.id, { fileName: 'a.txt', format: 'text' });
    const batchB = await batchBegin(db, b.id, { fileName: 'b.txt', format: 'text' });
    // Interleaved chunks of two projects give each project non-consecutive ids.
    await batchAppend(db, batchA, { utterances: many(7, 0) });
    await batchAppend(db, batchB, { utterances: many(5, 100) });
    await batchAppend(db, batchA, { utterances: many(6, 7) });
    const texts: string[] = [];
    const seqs: number[] = [];
    let after: number | null = null;
    for (;;) {
      const page = await utterancePage(db, a.id, after, 4);
      if (page.length === 0) break;
      expect(page.length).toBeLessThanOrEqual(4);
      texts.push(...page.map((u) => u.text));
      seqs.push(...page.map((u) => u.seq));
      after = page[page.length - 1]?.seq ?? null;
    }
    expect(texts).toEqual(many(13).map((u) => u.text));
    expect(seqs).toEqual(Array.from({ length: 13 }, (_, i) => i + 1));
    expect((await utterancePage(db, b.id, 2, 10)).map((u) => u.seq)).toEqual([3, 4, 5]);
    expect(await utteranceCount(db, a.id)).toBe(13);
    expect((await utteranceGet(db, 1))?.text).toBe('book visit number 0');
  });

  it('continues seq after a rolled-back tail without repeating a live one', async () => {
    const db = dbTest();
    const p = await projectCreate(db, { name: 'A' });
    const kept = await batchBegin(db, p.id, { fileName: 'a.txt', format: 'text' });
    await batchAppend(db, kept, { utterances: many(3) });
    const dropped = await batchBegin(db, p.id, { fileName: 'b.txt', format: 'text' });
    await batchAppend(db, dropped, { utterances: many(2) });
    await batchRollback(db, dropped);
    const again = await batchBegin(db, p.id, { fileName: 'c.txt', format: 'text' });
    expect((await batchAppend(db, again, { utterances: many(1) })).seqFirst).toBe(4);
  });

  it('counts layers by annotator and status from the index', async () => {
    const db = dbTest();
    const p = await projectCreate(db, { name: 'A' });
    const batchId = await batchBegin(db, p.id, { fileName: 'a.iob', format: 'columns', annotator: 'ana', layerStatus: 'draft' });
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: many(5) });
    await layerSave(db, [utteranceIds[0] as number, 'ana'], { status: 'done' }, { expectedRevision: 1, who: 'ana' });
    await layerSave(db, [utteranceIds[1] as number, 'ana'], { status: 'flagged' }, { expectedRevision: 1, who: 'ana' });
    await layerSave(db, [utteranceIds[1] as number, 'gold'], { status: 'done' }, { expectedRevision: 0, who: 'cy' });
    const other = await projectCreate(db, { name: 'B' });
    expect(await projectCounts(db, p.id)).toEqual({
      utterances: 5,
      layers: {
        ana: { unlabelled: 0, draft: 3, done: 1, skipped: 0, flagged: 1 },
        gold: { unlabelled: 0, draft: 0, done: 1, skipped: 0, flagged: 0 },
      },
    });
    expect(await projectCounts(db, other.id)).toEqual({ utterances: 0, layers: {} });
  });
});
