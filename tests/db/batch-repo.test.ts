import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin, batchFinish, batchRollback, idRuns } from '../../src/db/batch-repo';
import { BatchStateError, InvalidInputError, RecordMissingError } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { tokensUnpack } from '../../src/db/tokens';
import { utteranceMake } from './helpers';
import { dbDump } from './dump';
import { dbTest, SAMPLE } from './helpers';

async function projectWithBatch(db: SlotsmithDb, annotator?: string) {
  const project = await projectCreate(db, { name: 'Repairs' });
  const meta = annotator === undefined ? { fileName: 'visits.iob', format: 'columns' } : { fileName: 'visits.iob', format: 'columns', annotator };
  return { projectId: project.id, batchId: await batchBegin(db, project.id, meta) };
}

describe('import batches', () => {
  it('stores utterances and the annotator layers with tags exactly as given, illegal ones included', async () => {
    const db = dbTest();
    const { projectId, batchId } = await projectWithBatch(db, 'ana');
    const { utteranceIds, seqFirst } = await batchAppend(db, batchId, { utterances: SAMPLE });
    expect(seqFirst).toBe(1);
    const rows = await db.utterances.bulkGet(utteranceIds);
    rows.forEach((row, i) => {
      const u = SAMPLE[i];
      expect(row).toMatchObject({ projectId, seq: i + 1, text: u?.text, meta: u?.meta, source: { batchId } });
      expect(tokensUnpack(row?.tokens ?? [])).toEqual(u?.tokens);
      expect(row?.externalId).toBe(u?.id);
      expect(row?.source.line).toBe(u?.line);
      // The intent went to the layer, not to a hint.
      expect(row?.intentHint).toBeUndefined();
    });
    const layers = await db.layers.bulkGet(utteranceIds.map((id): [number, string] => [id, 'ana']));
    expect(layers.map((l) => l?.tags)).toEqual(SAMPLE.map((u) => u.tags));
    expect(layers[1]?.tags).toContain('I-day');
    expect(layers.map((l) => l?.intent)).toEqual(SAMPLE.map((u) => u.intent ?? null));
    expect(layers.every((l) => l?.status === 'done' && l.revision === 1 && l.batchId === batchId && l.projectId === projectId)).toBe(true);
    expect(await db.annotators.get([projectId, 'ana'])).toMatchObject({ role: 'annotator' });
    expect((await db.batches.get(batchId))?.counts).toEqual({ utterances: 4, tokens: SAMPLE.reduce((n, u) => n + u.tokens.length, 0), layers: 4 });
  });

  it('keeps the file intent as a hint when no annotator receives the labels', async () => {
    const db = dbTest();
    const { batchId } = await projectWithBatch(db);
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE });
    expect((await db.utterances.bulkGet(utteranceIds)).map((u) => u?.intentHint)).toEqual(SAMPLE.map((u) => u.intent));
    expect(await db.layers.count()).toBe(0);
  });

  it('numbers chunks on from the last seq and lets a chunk name its own annotator', async () => {
    const db = dbTest();
    const { projectId, batchId } = await projectWithBatch(db, 'ana');
    await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 3) });
    const second = await batchAppend(db, batchId, { utterances: SAMPLE.slice(3), annotator: 'bo' });
    expect(second.seqFirst).toBe(4);
    expect(await db.layers.get([second.utteranceIds[0] as number, 'bo'])).toBeDefined();
    expect(await db.annotators.get([projectId, 'bo'])).toBeDefined();
    const finished = await batchFinish(db, batchId, { utterances: 4, warnings: [{ line: 7, message: 'blank token' }] });
    expect(finished).toMatchObject({ state: 'done', warnings: [{ line: 7, message: 'blank token' }] });
    expect(finished.finished).toBeGreaterThan(finished.created);
  });

  it('stores nothing of a chunk with a bad utterance in the middle', async () => {
    const db = dbTest();
    const { batchId } = await projectWithBatch(db, 'ana');
    await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 1) });
    const before = await dbDump(db);
    const bad = utteranceMake('fix the boiler', ['O', 'B-service'], { line: 40 });
    const error = await batchAppend(db, batchId, { utterances: [SAMPLE[1], bad, SAMPLE[2]].map((u) => u ?? bad) }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(InvalidInputError);
    expect((error as Error).message).toMatch(/utterance 2 of the chunk \(file line 40\): 2 tags for 3 tokens/);
    const outside = { ...utteranceMake('call me'), tokens: [{ start: 0, end: 99 }], tags: ['O'] };
    await expect(batchAppend(db, batchId, { utterances: [outside] })).rejects.toBeInstanceOf(InvalidInputError);
    expect(await dbDump(db)).toEqual(before);
  });

  it('rolls back every chunk of a batch, with later layers and history on its utterances, and nothing else', async () => {
    const db = dbTest();
    const { projectId, batchId } = await projectWithBatch(db, 'ana');
    const other = await batchBegin(db, projectId, { fileName: 'older.txt', format: 'text' });
    await batchAppend(db, other, { utterances: SAMPLE.slice(0, 1) });
    await batchFinish(db, other, { utterances: 1 });
    const before = await dbDump(db);
    const first = await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 2) });
    await batchAppend(db, batchId, { utterances: SAMPLE.slice(2) });
    // Another tab labels an utterance of the running import.
    await layerSave(db, [first.utteranceIds[0] as number, 'bo'], { status: 'draft' }, { expectedRevision: 0, who: 'bo' });
    const report = await batchRollback(db, batchId, { state: 'failed', failure: 'reader crashed' });
    expect(report).toEqual({ batchId, utterances: 4, layers: 5, history: 1 });
    const after = await dbDump(db);
    const { batches: batchesAfter, annotators: annotatorsAfter, ...restAfter } = after;
    const { batches: batchesBefore, annotators: _a, ...restBefore } = before;
    expect(restAfter).toEqual(restBefore);
    expect(annotatorsAfter?.map((a) => (a as { id: string }).id)).toEqual(['ana', 'bo']);
    expect(batchesAfter).toHaveLength(batchesBefore?.length ?? -1);
    expect(await db.batches.get(batchId)).toMatchObject({ state: 'failed', failure: 'reader crashed' });
    await expect(batchAppend(db, batchId, { utterances: SAMPLE })).rejects.toBeInstanceOf(BatchStateError);
    await expect(batchFinish(db, batchId, { utterances: 0 })).rejects.toBeInstanceOf(BatchStateError);
  });

  it('cancels by default, refuses finished batches and catches a lost chunk at finish', async () => {
    const db = dbTest();
    const { projectId, batchId } = await projectWithBatch(db);
    await batchAppend(db, batchId, { utterances: SAMPLE });
    await expect(batchFinish(db, batchId, { utterances: 5 })).rejects.toThrow(/5 utterances were read but 4 stored/);
    await batchFinish(db, batchId, { utterances: 4 });
    await expect(batchRollback(db, batchId)).rejects.toBeInstanceOf(BatchStateError);
    const second = await batchBegin(db, projectId, { fileName: 'b.txt', format: 'text' });
    await batchRollback(db, second);
    expect((await db.batches.get(second))?.state).toBe('cancelled');
    await expect(batchRollback(db, 99)).rejects.toBeInstanceOf(RecordMissingError);
    await expect(batchBegin(db, 99, { fileName: 'c.txt', format: 'text' })).rejects.toBeInstanceOf(RecordMissingError);
  });

  it('finds runs of consecutive ids', () => {
    expect(idRuns([7, 3, 4, 5, 9, 8, 12])).toEqual([[3, 5], [7, 9], [12, 12]]);
    expect(idRuns([])).toEqual([]);
  });
});
