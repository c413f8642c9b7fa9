/** batchAppend's `attach: 'external-id'`: a second annotator's file of the same utterances adds layers, not rows. */
import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin, batchFinish, batchRollback } from '../../src/db/batch-repo';
import { InvalidInputError } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { tokensPack } from '../../src/db/tokens';
import { dbDump } from './dump';
import { dbTest, SAMPLE, utteranceMake } from './helpers';

/** A project holding SAMPLE as ana's finished import; returns its id. */
async function projectWithAna(db: SlotsmithDb): Promise<number> {
  const { id: projectId } = await projectCreate(db, { name: 'Repairs' });
  const batchId = await batchBegin(db, projectId, { fileName: 'ana.iob2', format: 'columns', annotator: 'ana' });
  await batchAppend(db, batchId, { utterances: SAMPLE, attach: 'external-id' });
  await batchFinish(db, batchId, { utterances: SAMPLE.length });
  return projectId;
}

/** SAMPLE as a second annotator tagged it: same ids, texts and tokens, other tags. */
const BEN = SAMPLE.map((u) => ({ ...u, tags: u.tags.map(() => 'O'), intent: 'check_status' }));

describe('attaching layers by external id', () => {
  it('stores one utterance with two layers when the id, text and tokens match', async () => {
    const db = dbTest();
    const projectId = await projectWithAna(db);
    const batchId = await batchBegin(db, projectId, { fileName: 'ben.iob2', format: 'columns', annotator: 'ben' });
    const result = await batchAppend(db, batchId, { utterances: BEN, attach: 'external-id' });
    // SAMPLE[2] has no id, so it cannot attach and becomes a new row.
    expect(result.attached).toBe(3);
    expect(await db.utterances.count()).toBe(SAMPLE.length + 1);
    const existing = await db.utterances.where('[projectId+externalId]').equals([projectId, 'hr-002']).toArray();
    expect(existing.map((u) => u.id)).toEqual([result.utteranceIds[1]]);
    const onRow = await db.layers.where('[utteranceId+annotator]').between([result.utteranceIds[1], ''], [result.utteranceIds[1], '\uffff']).toArray();
    expect(onRow.map((l) => l.annotator)).toEqual(['ana', 'ben']);
    const ana = await db.layers.get([result.utteranceIds[1] as number, 'ana']);
    const ben = await db.layers.get([result.utteranceIds[1] as number, 'ben']);
    expect(ana?.tags).toEqual(SAMPLE[1]?.tags);
    expect(ben).toMatchObject({ tags: ['O', 'O', 'O', 'O', 'O'], intent: 'check_status', batchId });
    const batch = await db.batches.get(batchId);
    expect(batch?.counts).toEqual({ utterances: 1, tokens: SAMPLE[2]?.tokens.length, layers: 4 });
    expect(batch?.attached).toBe(3);
    // Read count = new rows + attached ones.
    await expect(batchFinish(db, batchId, { utterances: 4 })).resolves.toMatchObject({ state: 'done' });
  });

  it('refuses an id whose text differs, naming the id and both texts, and stores nothing of the chunk', async () => {
    const db = dbTest();
    const projectId = await projectWithAna(db);
    const batchId = await batchBegin(db, projectId, { fileName: 'ben.iob2', format: 'columns', annotator: 'ben' });
    const before = await dbDump(db);
    const changed = utteranceMake('move it to Tuesday please', undefined, { id: 'hr-002' });
    const chunk = [utteranceMake('fix the boiler today', undefined, { id: 'hr-900' }), changed];
    const append = batchAppend(db, batchId, { utterances: chunk, attach: 'external-id' });
    await expect(append).rejects.toBeInstanceOf(InvalidInputError);
    await expect(append).rejects.toThrow(/"hr-002".*"move it to Monday please".*"move it to Tuesday please"/);
    expect(await dbDump(db)).toEqual(before);
  });

  it('refuses an id with the same text but other token offsets', async () => {
    const db = dbTest();
    const projectId = await projectWithAna(db);
    const batchId = await batchBegin(db, projectId, { fileName: 'ben.iob2', format: 'columns', annotator: 'ben' });
    const u = SAMPLE[0];
    if (u === undefined) throw new Error('sample');
    // "book a" as one token: the tag indices would mean other words.
    const merged = { ...u, tokens: [{ start: 0, end: 6 }, ...u.tokens.slice(2)], tags: u.tags.slice(1) };
    expect(tokensPack(merged.tokens)).not.toEqual(tokensPack(u.tokens));
    await expect(batchAppend(db, batchId, { utterances: [merged], attach: 'external-id' })).rejects.toThrow(/"hr-001".*different tokens/);
  });

  it('refuses a second layer by the same annotator, leaving the stored one untouched', async () => {
    const db = dbTest();
    const projectId = await projectWithAna(db);
    const batchId = await batchBegin(db, projectId, { fileName: 'ana-again.iob2', format: 'columns', annotator: 'ana' });
    const before = await dbDump(db);
    await expect(batchAppend(db, batchId, { utterances: BEN, attach: 'external-id' })).rejects.toThrow(/already has a layer by "ana"/);
    expect(await dbDump(db)).toEqual(before);
  });

  it('rollback removes the attached layers and their history but keeps the older utterances', async () => {
    const db = dbTest();
    const projectId = await projectWithAna(db);
    const utterancesBefore = await db.utterances.toArray();
    const batchId = await batchBegin(db, projectId, { fileName: 'ben.iob2', format: 'columns', annotator: 'ben' });
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: BEN, attach: 'external-id' });
    await layerSave(db, [utteranceIds[0] as number, 'ben'], { status: 'flagged' }, { expectedRevision: 1, who: 'ben' });
    const report = await batchRollback(db, batchId, { state: 'failed', failure: 'test' });
    // One new row (SAMPLE[2] has no id) with its layer, three attached layers, one history entry.
    expect(report).toEqual({ batchId, utterances: 1, layers: 4, history: 1 });
    expect(await db.utterances.toArray()).toEqual(utterancesBefore);
    expect((await db.layers.toArray()).map((l) => l.annotator)).toEqual(SAMPLE.map(() => 'ana'));
    expect(await db.history.count()).toBe(0);
  });

  it('never attaches to rows of the same batch, so a file repeating an id imports as before', async () => {
    const db = dbTest();
    const { id: projectId } = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, projectId, { fileName: 'ana.iob2', format: 'columns', annotator: 'ana' });
    const twice = utteranceMake('book a plumber', undefined, { id: 'hr-010' });
    await batchAppend(db, batchId, { utterances: [twice], attach: 'external-id' });
    const second = await batchAppend(db, batchId, { utterances: [twice], attach: 'external-id' });
    expect(second.attached).toBe(0);
    expect(await db.utterances.count()).toBe(2);
  });

  it('needs an annotator', async () => {
    const db = dbTest();
    const { id: projectId } = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, projectId, { fileName: 'u.txt', format: 'text' });
    await expect(batchAppend(db, batchId, { utterances: SAMPLE, attach: 'external-id' })).rejects.toBeInstanceOf(InvalidInputError);
  });
});
