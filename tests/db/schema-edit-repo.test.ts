import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { ProjectSchema } from '../../src/core/backup/model';
import { spansFromTags } from '../../src/core/schemes';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { InvalidInputError, StorageFullError } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectGet } from '../../src/db/project-repo';
import { intentDelete, intentRename, intentUsage, schemaSave, slotDelete, slotRename, slotUsage } from '../../src/db/schema-edit-repo';
import type { LayerRow, SlotsmithDb } from '../../src/db/schema';
import { dbDump } from './dump';
import { dbTest, SAMPLE, utteranceMake } from './helpers';
import { quotaFake, type QuotaFake } from './quota-fake';

const SCHEMA: ProjectSchema = {
  slots: [
    { name: 'service', key: 's' },
    { name: 'problem', key: 'r' },
    { name: 'day', key: 'd', colour: '#56B4E9', intents: ['book_visit', 'reschedule'] },
    { name: 'time_window' },
    { name: 'contact_phone' },
  ],
  intents: [{ name: 'book_visit' }, { name: 'reschedule' }, { name: 'ask_price' }],
};
const WHO = { who: 'rosa' };

/** Two projects with SAMPLE as ana's layers; the first also has ben, gold and model layers on some utterances. */
async function seed(db: SlotsmithDb) {
  const project = await projectCreate(db, { name: 'Repairs', schema: SCHEMA });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.iob', format: 'columns', annotator: 'ana' });
  const ids = (await batchAppend(db, batchId, { utterances: SAMPLE })).utteranceIds as [number, number, number, number];
  await layerSave(db, [ids[0], 'ben'], { tags: ['O', 'O', 'B-service', 'O', 'B-day', 'I-day'], intent: 'book_visit' }, { expectedRevision: 0, who: 'ben' });
  await layerSave(db, [ids[1], 'gold'], { tags: ['O', 'O', 'O', 'B-day', 'O'], intent: 'reschedule' }, { expectedRevision: 0, who: 'ben' });
  await layerSave(db, [ids[0], 'model'], { tags: ['O', 'O', 'O', 'O', 'O', 'O'], intent: 'ask_price' }, { expectedRevision: 0, who: 'model' });
  const other = await projectCreate(db, { name: 'Other', schema: SCHEMA });
  const otherBatch = await batchBegin(db, other.id, { fileName: 'b.iob', format: 'columns', annotator: 'ana' });
  await batchAppend(db, otherBatch, { utterances: SAMPLE });
  return { projectId: project.id, otherId: other.id, ids };
}

async function layersOfProject(db: SlotsmithDb, projectId: number): Promise<LayerRow[]> {
  return (await db.layers.toArray()).filter((l) => l.projectId === projectId);
}

/** The reference count: spansFromTags over every stored layer. */
function spanCount(layers: readonly LayerRow[], slot: string) {
  const per = layers.map((l) => spansFromTags(l.tags).filter((s) => s.slot === slot).length);
  return { spans: per.reduce((a, b) => a + b, 0), layers: per.filter((n) => n > 0).length, annotators: [...new Set(layers.filter((_, i) => (per[i] ?? 0) > 0).map((l) => l.annotator))].sort() };
}

describe('slot usage', () => {
  it('counts the spans and layers of a slot over every layer owner, as spansFromTags reads them', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const layers = await layersOfProject(db, projectId);
    const usage = await slotUsage(db, projectId, 'day');
    expect(usage).toEqual(spanCount(layers, 'day'));
    // Three of ana's (one an illegal stray I-day), ben's, and gold's; the model layer has none.
    expect(usage).toEqual({ spans: 5, layers: 5, annotators: ['ana', 'ben', 'gold'] });
    expect(await slotUsage(db, projectId, 'budget')).toEqual({ spans: 0, layers: 0, annotators: [] });
    expect(await intentUsage(db, projectId, 'book_visit')).toEqual({ spans: 0, layers: 2, annotators: ['ana', 'ben'] });
  });
});

describe('slot rename', () => {
  it('rewrites every layer and the schema, with a history row and a new revision per changed layer', async () => {
    const db = dbTest();
    const { projectId, otherId } = await seed(db);
    const before = await layersOfProject(db, projectId);
    const otherBefore = await layersOfProject(db, otherId);
    const historyBefore = await db.history.count();
    const report = await slotRename(db, projectId, 'day', 'visit.day', WHO);
    expect({ spans: report.spans, layers: report.layers, annotators: report.annotators }).toEqual(spanCount(before, 'day'));
    expect(report.project.schema.slots.map((s) => s.name)).toEqual(['service', 'problem', 'visit.day', 'time_window', 'contact_phone']);
    expect(report.project.schema.slots[2]).toEqual({ name: 'visit.day', key: 'd', colour: '#56B4E9', intents: ['book_visit', 'reschedule'] });
    expect((await projectGet(db, projectId))?.schema).toEqual(report.project.schema);

    const after = await layersOfProject(db, projectId);
    const history = (await db.history.toArray()).slice(historyBefore);
    expect(history).toHaveLength(report.layers);
    for (const old of before) {
      const now = after.find((l) => l.utteranceId === old.utteranceId && l.annotator === old.annotator) as LayerRow;
      const expectedTags = old.tags.map((t) => (t.endsWith('-day') ? `${t[0]}-visit.day` : t));
      expect(now.tags).toEqual(expectedTags);
      const changed = expectedTags.some((t, i) => t !== old.tags[i]);
      expect(now.revision).toBe(old.revision + (changed ? 1 : 0));
      const row = history.find((h) => h.utteranceId === old.utteranceId && h.annotator === old.annotator);
      if (!changed) {
        expect(row).toBeUndefined();
        continue;
      }
      expect(row).toMatchObject({ projectId, who: 'rosa', when: now.updated, before: { tags: old.tags, revision: old.revision }, after: { tags: expectedTags, revision: old.revision + 1 } });
    }
    // The stray I-day stays a stray I- (illegal sequences are kept exactly).
    expect(after.find((l) => l.annotator === 'ana' && l.tags.includes('I-visit.day'))?.tags).toEqual(['O', 'O', 'O', 'I-visit.day', 'O']);
    // The other project is untouched.
    expect(await layersOfProject(db, otherId)).toEqual(otherBefore);
    expect((await projectGet(db, otherId))?.schema).toEqual(SCHEMA);
  });

  it('renames back to the original tags (revisions move on)', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await layersOfProject(db, projectId);
    await slotRename(db, projectId, 'day', 'visit.day', WHO);
    await slotRename(db, projectId, 'visit.day', 'day', WHO);
    expect((await layersOfProject(db, projectId)).map((l) => l.tags)).toEqual(before.map((l) => l.tags));
    expect((await projectGet(db, projectId))?.schema).toEqual(SCHEMA);
  });

  it('refuses bad or taken names before writing anything', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await dbDump(db);
    await expect(slotRename(db, projectId, 'day', 'visit day', WHO)).rejects.toThrow(/spaces/);
    await expect(slotRename(db, projectId, 'day', 'service', WHO)).rejects.toThrow(/already called service/);
    await expect(slotRename(db, projectId, 'budget', 'cost', WHO)).rejects.toThrow(/no slot called budget/);
    await expect(slotRename(db, 99, 'day', 'when', WHO)).rejects.toThrow(/does not exist/);
    expect(await dbDump(db)).toEqual(before);
  });

  it('fails half-way through a big project when a later layer already uses the new name, and changes nothing', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Big', schema: SCHEMA });
    const batchId = await batchBegin(db, project.id, { fileName: 'big.iob', format: 'columns', annotator: 'ana' });
    // More layers than one read slice (1,000), so the first slice is written before the clash is found.
    const utterances = Array.from({ length: 1200 }, (_, i) => utteranceMake(`plumber on day${i}`, ['B-service', 'O', 'B-day'], { id: `big-${i}` }));
    utterances.push(utteranceMake('booking 555-0117 on Monday', ['O', 'B-booking_ref', 'O', 'B-day'], { id: 'big-last' }));
    await batchAppend(db, batchId, { utterances });
    const before = await dbDump(db);
    const error = await slotRename(db, project.id, 'day', 'booking_ref', WHO).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(InvalidInputError);
    expect((error as Error).message).toMatch(/would merge two slots/);
    expect(await dbDump(db)).toEqual(before);
  });
});

describe('slot delete', () => {
  it('turns the slot’s tags into O everywhere and removes it from the schema', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await layersOfProject(db, projectId);
    const report = await slotDelete(db, projectId, 'day', WHO);
    expect({ spans: report.spans, layers: report.layers, annotators: report.annotators }).toEqual(spanCount(before, 'day'));
    const after = await layersOfProject(db, projectId);
    expect(after.map((l) => l.tags)).toEqual(before.map((l) => l.tags.map((t) => (t.endsWith('-day') ? 'O' : t))));
    expect(spanCount(after, 'day').spans).toBe(0);
    expect(report.project.schema.slots.map((s) => s.name)).toEqual(['service', 'problem', 'time_window', 'contact_phone']);
    expect((await db.history.toArray()).filter((h) => h.who === 'rosa')).toHaveLength(report.layers);
  });
});

describe('intent rename and delete', () => {
  it('renames the intent in layers, the intent list and the slots’ allowed lists', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await layersOfProject(db, projectId);
    const report = await intentRename(db, projectId, 'book_visit', 'book', WHO);
    expect(report.layers).toBe(before.filter((l) => l.intent === 'book_visit').length);
    const after = await layersOfProject(db, projectId);
    expect(after.map((l) => l.intent)).toEqual(before.map((l) => (l.intent === 'book_visit' ? 'book' : l.intent)));
    expect(report.project.schema.intents.map((i) => i.name)).toEqual(['book', 'reschedule', 'ask_price']);
    expect(report.project.schema.slots[2]?.intents).toEqual(['book', 'reschedule']);
    await expect(intentRename(db, projectId, 'book', 'reschedule', WHO)).rejects.toThrow(/already called reschedule/);
    await expect(intentRename(db, projectId, 'book', ' book', WHO)).rejects.toThrow(/start or end/);
  });

  it('renames the file’s intent of utterances nobody labelled, in this project only', async () => {
    const db = dbTest();
    const { projectId, otherId } = await seed(db);
    // Imported without an annotator: the file's intents are kept on the utterances as hints.
    const hinted = [
      utteranceMake('gutter needs clearing on Tuesday', undefined, { id: 'hr-h1', intent: 'book_visit' }),
      utteranceMake('what does a gutter clean cost', undefined, { id: 'hr-h2', intent: 'ask_price' }),
    ];
    for (const id of [projectId, otherId]) await batchAppend(db, await batchBegin(db, id, { fileName: 'hints.iob', format: 'columns' }), { utterances: hinted });
    const hints = async (id: number) => (await db.utterances.toArray()).filter((u) => u.projectId === id && u.intentHint !== undefined).map((u) => u.intentHint);
    expect(await hints(projectId)).toEqual(['book_visit', 'ask_price']);
    await intentRename(db, projectId, 'book_visit', 'book', WHO);
    expect(await hints(projectId)).toEqual(['book', 'ask_price']);
    expect(await hints(otherId)).toEqual(['book_visit', 'ask_price']);
  });

  it('deletes the intent: layers lose it, slots no longer list it', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await layersOfProject(db, projectId);
    const report = await intentDelete(db, projectId, 'reschedule', WHO);
    expect(report.layers).toBe(before.filter((l) => l.intent === 'reschedule').length);
    expect(report.layers).toBe(2);
    const after = await layersOfProject(db, projectId);
    expect(after.map((l) => l.intent)).toEqual(before.map((l) => (l.intent === 'reschedule' ? null : l.intent)));
    expect(report.project.schema.slots[2]?.intents).toEqual(['book_visit']);
  });
});

describe('plain schema saves', () => {
  it('stores a checked schema and refuses problems or dropped names', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const added: ProjectSchema = { ...SCHEMA, slots: [...SCHEMA.slots, { name: 'area.from', key: 'q', colour: '#E69F00' }] };
    expect((await schemaSave(db, projectId, added)).schema).toEqual(added);
    await expect(schemaSave(db, projectId, { ...added, slots: [...added.slots, { name: 'area.to', key: 'Q' }] })).rejects.toThrow(/already labels area.from/);
    await expect(schemaSave(db, projectId, SCHEMA)).rejects.toThrow(/rename or delete to remove area.from/);
    expect((await projectGet(db, projectId))?.schema).toEqual(added);
  });
});

describe('a full disk during a rename', () => {
  let quota: QuotaFake;
  beforeEach(async () => {
    quota = await quotaFake();
  });
  afterEach(() => quota.restore());

  it('leaves layers, history and schema as they were, wherever the write fails', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await dbDump(db);
    const changed = (await slotUsage(db, projectId, 'day')).layers;
    // Fail among the layer puts, among the history rows, and at the final schema write.
    for (const n of [2, changed + 2, 2 * changed]) {
      quota.failAfter(n);
      await expect(slotRename(db, projectId, 'day', 'visit.day', WHO)).rejects.toBeInstanceOf(StorageFullError);
      quota.failAfter(Infinity);
      expect(await dbDump(db)).toEqual(before);
    }
    await expect(slotDelete(db, projectId, 'day', WHO)).resolves.toMatchObject({ layers: changed });
  });
});
