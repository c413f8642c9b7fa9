import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { ProjectSchema } from '../../src/core/backup/model';
import { schemaValidate, tagsRepair, transitionsValidate } from '../../src/core/rules';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { RevisionConflictError, StorageFullError } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import { repairNoteOf, repairRecordFromHistory, rulesRepairApply, rulesRepairUndo, rulesScan, ruleSchemaOf, type RepairNote, type RepairTarget, type RulesScan } from '../../src/db/rules-repo';
import type { LayerRow, SlotsmithDb } from '../../src/db/schema';
import { dbDump } from './dump';
import { dbTest, SAMPLE, utteranceMake } from './helpers';
import { quotaFake, type QuotaFake } from './quota-fake';

const SCHEMA: ProjectSchema = {
  slots: [{ name: 'service' }, { name: 'problem' }, { name: 'day', intents: ['book_visit', 'reschedule'] }, { name: 'time_window' }, { name: 'contact_phone' }],
  intents: [{ name: 'book_visit' }, { name: 'reschedule' }, { name: 'ask_price' }],
};
const WHO = 'lead';

/** SAMPLE as ana's layers (one stray I-day), plus ben and gold layers with more problems, and a second project. */
async function seed(db: SlotsmithDb) {
  const project = await projectCreate(db, { name: 'Repairs', schema: SCHEMA });
  const batchId = await batchBegin(db, project.id, { fileName: 'ana.iob', format: 'columns', annotator: 'ana' });
  const extra = [
    utteranceMake('price for a painter on tuesday', ['O', 'O', 'O', 'I-service', 'O', 'B-day'], { intent: 'ask_price' }),
    utteranceMake('fix the boiler call 555-0117', ['O', 'O', 'B-problem', 'I-service', 'B-contact_phone'], { intent: 'book_visit' }),
  ];
  const ids = (await batchAppend(db, batchId, { utterances: [...SAMPLE, ...extra] })).utteranceIds;
  await layerSave(db, [ids[0] as number, 'ben'], { tags: ['O', 'O', 'I-service', 'O', 'B-day', 'I-time_window'], intent: 'book_visit' }, { expectedRevision: 0, who: 'ben' });
  await layerSave(db, [ids[1] as number, 'gold'], { tags: ['O', 'O', 'O', 'B-day', 'O'], intent: 'reschedule' }, { expectedRevision: 0, who: 'lead' });
  await layerSave(db, [ids[2] as number, 'gold'], { tags: ['O', 'O', 'O', 'O', 'O', 'B-budget', 'I-budget', 'O'], intent: 'ask_price' }, { expectedRevision: 0, who: 'lead' });
  const other = await projectCreate(db, { name: 'Other', schema: SCHEMA });
  const otherBatch = await batchBegin(db, other.id, { fileName: 'b.iob', format: 'columns', annotator: 'ana' });
  await batchAppend(db, otherBatch, { utterances: SAMPLE });
  return { projectId: project.id, otherId: other.id, ids };
}

const targetsOf = (scan: RulesScan): RepairTarget[] => scan.layers.map((l) => ({ utteranceId: l.utteranceId, annotator: l.annotator, revision: l.revision }));
const layersOfProject = async (db: SlotsmithDb, projectId: number): Promise<LayerRow[]> => (await db.layers.toArray()).filter((l) => l.projectId === projectId);
const findingList = (scan: RulesScan) => scan.layers.flatMap((l) => l.findings.map((f) => [l.seq, l.annotator, f.rule, f.index]));

describe('rule scan', () => {
  it('lists the findings of every layer owner as the core validators give them, with the words', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const scan = await rulesScan(db, projectId);
    const layers = await layersOfProject(db, projectId);
    const schema = ruleSchemaOf(SCHEMA);
    // The reference: transitionsValidate and schemaValidate over every stored layer of the project.
    const want = layers.map((l) => transitionsValidate(l.tags, 'iob2').length + (schema === null ? 0 : schemaValidate({ tags: l.tags, intent: l.intent ?? undefined }, schema).length));
    expect(scan.findings).toBe(want.reduce((a, b) => a + b, 0));
    expect(scan.layersScanned).toBe(layers.length);
    expect(scan.layers).toHaveLength(want.filter((n) => n > 0).length);
    expect(new Set(scan.layers.map((l) => l.annotator))).toEqual(new Set(['ana', 'ben', 'gold']));
    const stray = scan.layers.find((l) => l.seq === 2 && l.annotator === 'ana');
    expect(stray?.words).toEqual(['move', 'it', 'to', 'Monday', 'please']);
    expect(stray?.findings).toEqual([{ rule: 'iob2/inside-after-outside', kind: 'transition', index: 3, message: 'I-day follows O: a span must start with B-day' }]);
    // budget is not a slot of the project: a schema finding on the gold layer.
    expect(scan.layers.find((l) => l.seq === 3 && l.annotator === 'gold')?.findings.map((f) => f.rule)).toEqual(['schema/unknown-slot']);
    expect(scan.layers.map((l) => l.seq)).toEqual([...scan.layers.map((l) => l.seq)].sort((a, b) => a - b));
  });
});

describe('rule scan on a project larger than one slice', () => {
  it('reports progress slice by slice and finds every stray I- tag', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Big', schema: SCHEMA });
    const batchId = await batchBegin(db, project.id, { fileName: 'big.iob', format: 'columns', annotator: 'ana' });
    // Every 97th utterance has a stray I-day after O.
    const utterances = Array.from({ length: 2500 }, (_, i) => utteranceMake(`visit on friday ${i}`, ['O', 'O', i % 97 === 0 ? 'I-day' : 'B-day', 'O'], { intent: 'book_visit' }));
    await batchAppend(db, batchId, { utterances });
    const progress: string[] = [];
    const scan = await rulesScan(db, project.id, (p) => progress.push(`${p.done}/${p.total}`));
    expect(progress).toEqual(['1000/2500', '2000/2500', '2500/2500']);
    expect(scan.layers.map((l) => l.seq)).toEqual(Array.from({ length: 2500 }, (_, i) => i).filter((i) => i % 97 === 0).map((i) => i + 1));
    expect(scan.findings).toBe(scan.layers.length);
  });
});

describe('rule repair and undo', () => {
  it('repairs every listed layer in one go: no transition finding left, one revision and history row each, others untouched', async () => {
    const db = dbTest();
    const { projectId, otherId } = await seed(db);
    const scan = await rulesScan(db, projectId);
    const before = await layersOfProject(db, projectId);
    const otherBefore = await layersOfProject(db, otherId);
    const historyBefore = await db.history.count();
    const record = await rulesRepairApply(db, projectId, targetsOf(scan), { strategy: 'begin-span', schemaSpans: false, who: WHO });
    const again = await rulesScan(db, projectId);
    expect(again.layers.flatMap((l) => l.findings).filter((f) => f.kind === 'transition')).toEqual([]);
    // Exactly the layers with an illegal transition changed, each as the core's tagsRepair says.
    const illegal = before.filter((l) => transitionsValidate(l.tags, 'iob2').length > 0);
    expect(record.layers.map((l) => [l.utteranceId, l.annotator]).sort()).toEqual(illegal.map((l) => [l.utteranceId, l.annotator]).sort());
    const after = await layersOfProject(db, projectId);
    for (const old of before) {
      const now = after.find((l) => l.utteranceId === old.utteranceId && l.annotator === old.annotator) as LayerRow;
      const repaired = illegal.includes(old);
      expect(now.tags).toEqual(repaired ? tagsRepair(old.tags, 'iob2', 'begin-span').after : old.tags);
      expect(now.revision).toBe(old.revision + (repaired ? 1 : 0));
    }
    const history = (await db.history.toArray()).slice(historyBefore);
    expect(history).toHaveLength(illegal.length);
    expect(history.every((h) => h.who === WHO && h.when === record.when && h.before !== null)).toBe(true);
    expect(await layersOfProject(db, otherId)).toEqual(otherBefore);
  });

  it('with schema repair on, drops the spans the schema refuses too; drop-stray turns stray I- tags to O', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    await rulesRepairApply(db, projectId, targetsOf(await rulesScan(db, projectId)), { strategy: 'drop-stray', schemaSpans: true, who: WHO });
    const again = await rulesScan(db, projectId);
    expect(findingList(again)).toEqual([]);
    const ana = await db.layers.get([2, 'ana']);
    expect(ana?.tags).toEqual(['O', 'O', 'O', 'O', 'O']);
  });

  it('undo puts back the exact previous tags in one transaction, recorded in the history; a second scan lists the same findings', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const scan = await rulesScan(db, projectId);
    const before = await layersOfProject(db, projectId);
    const record = await rulesRepairApply(db, projectId, targetsOf(scan), { strategy: 'begin-span', schemaSpans: true, who: WHO });
    const historyBefore = await db.history.count();
    expect(await rulesRepairUndo(db, record, { who: WHO })).toBe(record.layers.length);
    const after = await layersOfProject(db, projectId);
    expect(after.map((l) => l.tags)).toEqual(before.map((l) => l.tags));
    const restored = await rulesScan(db, projectId);
    expect(findingList(restored)).toEqual(findingList(scan));
    const history = (await db.history.toArray()).slice(historyBefore);
    expect(history.map((h) => h.after.tags)).toEqual(record.layers.map((l) => l.before));
    expect(history.map((h) => h.before?.tags)).toEqual(record.layers.map((l) => l.after));
    // Undo twice is refused: the layers moved on with the first undo.
    await expect(rulesRepairUndo(db, record, { who: WHO })).rejects.toBeInstanceOf(RevisionConflictError);
  });

  it('a repair rebuilt from its note (after a reload) is the same record and undoes the same; an edited layer makes its undo refuse', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const before = await layersOfProject(db, projectId);
    const record = await rulesRepairApply(db, projectId, targetsOf(await rulesScan(db, projectId)), { strategy: 'begin-span', schemaSpans: false, who: WHO });
    const note = repairNoteOf(record) as RepairNote;
    expect(note.history[1] - note.history[0] + 1).toBe(record.layers.length);
    // The note goes through JSON, as it does in localStorage.
    const rebuilt = await repairRecordFromHistory(db, JSON.parse(JSON.stringify(note)) as RepairNote);
    expect(rebuilt).toEqual(record);
    expect(await rulesRepairUndo(db, rebuilt!, { who: WHO })).toBe(record.layers.length);
    expect((await layersOfProject(db, projectId)).map((l) => l.tags)).toEqual(before.map((l) => l.tags));

    const again = await rulesRepairApply(db, projectId, targetsOf(await rulesScan(db, projectId)), { strategy: 'begin-span', schemaSpans: false, who: WHO });
    const edited = again.layers[0]!;
    await layerSave(db, [edited.utteranceId, edited.annotator], { note: 'checked' }, { expectedRevision: edited.revision, who: 'ana' });
    const stale = await repairRecordFromHistory(db, repairNoteOf(again)!);
    expect(stale?.layers[0]?.revision).toBe(-1);
    const dump = await dbDump(db);
    await expect(rulesRepairUndo(db, stale!, { who: WHO })).rejects.toBeInstanceOf(RevisionConflictError);
    expect(await dbDump(db)).toEqual(dump);
    // A note whose rows are not there (another database, or history cleared) gives nothing to undo.
    expect(await repairRecordFromHistory(db, { ...note, history: [note.history[0] + 10_000, note.history[1] + 10_000] })).toBeNull();
  });

  it('refuses, writing nothing, when a layer changed since the scan or since the repair', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const scan = await rulesScan(db, projectId);
    await layerSave(db, [2, 'ana'], { note: 'looked at it' }, { expectedRevision: 1, who: 'ana' });
    const dump = await dbDump(db);
    await expect(rulesRepairApply(db, projectId, targetsOf(scan), { strategy: 'begin-span', schemaSpans: false, who: WHO })).rejects.toBeInstanceOf(RevisionConflictError);
    expect(await dbDump(db)).toEqual(dump);

    const fresh = await rulesScan(db, projectId);
    const record = await rulesRepairApply(db, projectId, targetsOf(fresh), { strategy: 'begin-span', schemaSpans: false, who: WHO });
    const ben = record.layers.find((l) => l.annotator === 'ben') as { utteranceId: number; revision: number };
    await layerSave(db, [ben.utteranceId, 'ben'], { status: 'flagged' }, { expectedRevision: ben.revision, who: 'ben' });
    const repaired = await dbDump(db);
    await expect(rulesRepairUndo(db, record, { who: WHO })).rejects.toBeInstanceOf(RevisionConflictError);
    expect(await dbDump(db)).toEqual(repaired);
  });
});

describe('a failure in the middle of a repair or an undo', () => {
  let quota: QuotaFake;
  beforeEach(async () => {
    quota = await quotaFake();
  });
  afterEach(() => quota.restore());

  it('leaves every layer and the history as they were, wherever the write fails', async () => {
    const db = dbTest();
    const { projectId } = await seed(db);
    const targets = targetsOf(await rulesScan(db, projectId));
    const options = { strategy: 'begin-span' as const, schemaSpans: true, who: WHO };
    const dump = await dbDump(db);
    // Among the layer puts, among the history rows, and at the last history row.
    for (const n of [1, targets.length, 2 * targets.length - 1]) {
      quota.failAfter(n);
      await expect(rulesRepairApply(db, projectId, targets, options)).rejects.toBeInstanceOf(StorageFullError);
      quota.failAfter(Infinity);
      expect(await dbDump(db)).toEqual(dump);
    }
    const record = await rulesRepairApply(db, projectId, targets, options);
    expect(record.layers.length).toBe(targets.length);
    const repaired = await dbDump(db);
    quota.failAfter(2);
    await expect(rulesRepairUndo(db, record, { who: WHO })).rejects.toBeInstanceOf(StorageFullError);
    quota.failAfter(Infinity);
    expect(await dbDump(db)).toEqual(repaired);
    await rulesRepairUndo(db, record, { who: WHO });
  });
});
