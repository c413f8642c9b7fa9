import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { layersRead, layersWrite, packRead } from '../../src/core/exchange';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import {
  exchangeChoose,
  handBackMake,
  layersMerge,
  packOpen,
  packProgress,
  packsMake,
  projectExchange,
  type MergeOutcome,
} from '../../src/db/exchange-repo';
import { layerHistory, layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectSchemaSet } from '../../src/db/project-repo';
import type { LayerKey, SlotsmithDb } from '../../src/db/schema';
import { dbDump } from './dump';
import { dbTest, SAMPLE } from './helpers';

const SCHEMA = {
  slots: [{ name: 'service', description: 'The trade asked for.', examples: ['plumber'] }, { name: 'day' }],
  intents: [{ name: 'book_visit', description: 'Asks for a visit.' }, { name: 'reschedule' }],
};

/** The lead's master project: the four sample utterances (seqs 1–4), with ann-x layers on them unless `bare`. */
async function master(db: SlotsmithDb, bare = false): Promise<number> {
  const project = await projectCreate(db, { name: 'Boiler jobs', schema: SCHEMA });
  const meta = bare ? { fileName: 'a.txt', format: 'text' } : { fileName: 'a.iob', format: 'columns', annotator: 'ann-x', layerStatus: 'done' as const };
  const batchId = await batchBegin(db, project.id, meta);
  await batchAppend(db, batchId, { utterances: SAMPLE });
  await batchFinish(db, batchId, { utterances: SAMPLE.length });
  return project.id;
}

async function idOfSeq(db: SlotsmithDb, projectId: number, seq: number): Promise<number> {
  return (await db.utterances.where('[projectId+seq]').equals([projectId, seq]).first())?.id ?? -1;
}

/** A copy on another machine labels seq → tags/intent/status through the ordinary layer save. */
async function label(db: SlotsmithDb, projectId: number, annotator: string, seq: number, change: { tags?: string[]; intent?: string; status?: 'done' | 'skipped' | 'draft' }) {
  const key: LayerKey = [await idOfSeq(db, projectId, seq), annotator];
  const revision = (await db.layers.get(key))?.revision ?? 0;
  await layerSave(db, key, change, { expectedRevision: revision, who: annotator });
}

function summaryOf(outcome: MergeOutcome) {
  if (!outcome.ok) throw new Error(JSON.stringify(outcome.errors));
  return outcome.summary;
}

async function refusedWithoutChange(db: SlotsmithDb, projectId: number, text: string) {
  const before = await dbDump(db);
  const outcome = await layersMerge(db, projectId, text);
  expect(await dbDump(db)).toEqual(before);
  if (outcome.ok) throw new Error('expected a refusal');
  return outcome.errors;
}

/** Lead: ana gets seqs 1, 2, 3 and ben 1, 3, 4 (1 and 3 doubled). */
async function setup(bare = false) {
  const lead = dbTest();
  const projectId = await master(lead, bare);
  const packs = await packsMake(lead, projectId, new Map([['ana', [1, 2, 3]], ['ben', [1, 3, 4]]]), { names: { ana: 'Ana' } });
  const machineA = dbTest({ factory: new IDBFactory() });
  const machineB = dbTest({ factory: new IDBFactory() });
  const openA = await packOpen(machineA, packs[0]?.text ?? '');
  const openB = await packOpen(machineB, packs[1]?.text ?? '');
  if (!openA.ok || !openB.ok) throw new Error('packs did not open');
  return { lead, projectId, packs, machineA, machineB, copyA: openA.projectId, copyB: openB.projectId };
}

describe('packs', () => {
  it('makes one pack per annotator with the schema, a fingerprint and the chosen utterances', async () => {
    const { lead, projectId, packs } = await setup();
    expect(packs.map((p) => [p.annotator, p.count])).toEqual([['ana', 3], ['ben', 3]]);
    const exchange = await projectExchange(lead, projectId);
    expect(exchange?.uid).toMatch(/^[0-9a-f]{32}$/);
    expect(exchange?.packs.map((p) => [p.annotator, p.seqs, p.id])).toEqual([['ana', [1, 2, 3], packs[0]?.id], ['ben', [1, 3, 4], packs[1]?.id]]);
    const read = await packRead(packs[0]?.text ?? '');
    if (!read.ok) throw new Error('unreadable');
    expect(read.file.header.project.uid).toBe(exchange?.uid);
    expect(read.file.header.annotator).toEqual({ id: 'ana', name: 'Ana' });
    expect(read.file.header.setup.schema).toEqual(SCHEMA);
    expect(read.file.utterances.map((u) => [u.seq, u.externalId, u.text])).toEqual([[1, 'hr-001', SAMPLE[0]?.text], [2, 'hr-002', SAMPLE[1]?.text], [3, undefined, SAMPLE[2]?.text]]);
    expect(read.file.utterances[2]?.tokens).toEqual(SAMPLE[2]?.tokens.flatMap((t) => [t.start, t.end]));
    // The fingerprint is made once: later packs carry the same one.
    await packsMake(lead, projectId, new Map([['ana', [4]]]));
    expect((await projectExchange(lead, projectId))?.uid).toBe(exchange?.uid);
  });

  it('opens a pack on another machine as a project with just those utterances, the schema and suggestions', async () => {
    const lead = dbTest();
    const projectId = await master(lead);
    const [pack] = await packsMake(lead, projectId, new Map([['ana', [2, 4]]]), { suggestionsFrom: 'ann-x' });
    const other = dbTest({ factory: new IDBFactory() });
    const opened = await packOpen(other, pack?.text ?? '');
    expect(opened).toMatchObject({ ok: true, created: true, added: 2, count: 2, annotator: 'ana', name: 'Boiler jobs (pack for ana)' });
    if (!opened.ok) return;
    const project = await other.projects.get(opened.projectId);
    expect(project?.schema).toEqual(SCHEMA);
    const rows = await other.utterances.toArray();
    expect(rows.map((r) => [r.seq, r.externalId, r.text, Array.from(r.tokens)])).toEqual([
      [2, 'hr-002', SAMPLE[1]?.text, SAMPLE[1]?.tokens.flatMap((t) => [t.start, t.end])],
      [4, 'hr-004', SAMPLE[3]?.text, SAMPLE[3]?.tokens.flatMap((t) => [t.start, t.end])],
    ]);
    // Suggestions go to the model layer: the annotator's own layer starts empty.
    const layers = await other.layers.toArray();
    expect(layers.map((l) => [l.annotator, l.tags])).toEqual([['model', SAMPLE[1]?.tags], ['model', SAMPLE[3]?.tags]]);
    expect(await other.annotators.toArray()).toEqual([{ projectId: opened.projectId, id: 'ana', name: 'ana', role: 'annotator' }]);
    // Opening it again finds the same project and adds nothing.
    const again = await packOpen(other, pack?.text ?? '');
    expect(again).toMatchObject({ ok: true, projectId: opened.projectId, created: false, added: 0 });
    expect(await other.projects.count()).toBe(1);
  });

  it('opens a second pack of the same project into the matching project by fingerprint', async () => {
    const { packs, machineA, copyA } = await setup();
    const second = await packOpen(machineA, packs[1]?.text ?? '');
    expect(second).toMatchObject({ ok: true, projectId: copyA, created: false, added: 1, count: 3 });
    expect((await machineA.utterances.toArray()).map((r) => r.seq)).toEqual([1, 2, 3, 4]);
  });

  it('refuses a damaged pack or one that clashes with the matching project, storing nothing', async () => {
    const { lead, projectId, packs, machineA } = await setup();
    const before = await dbDump(machineA);
    const edited = (packs[0]?.text ?? '').replace('book a plumber', 'book a roofer');
    const damaged = await packOpen(machineA, edited);
    expect(damaged).toEqual({ ok: false, errors: [{ line: 2, message: 'this line was changed after the file was written (its check does not match)' }] });
    // The master's text changed after the packs went out: a new pack no longer fits the copy.
    await lead.utterances.where('[projectId+seq]').equals([projectId, 1]).modify({ text: 'book a plumber for Friday evening' });
    const [changed] = await packsMake(lead, projectId, new Map([['ana', [1]]]));
    const clash = await packOpen(machineA, changed?.text ?? '');
    expect(clash.ok ? null : clash.errors[0]?.message).toMatch(/utterance 1 differs from the one already in/);
    expect(await dbDump(machineA)).toEqual(before);
  });
});

describe('hand back and merge', () => {
  it('hands back only the annotator’s layers and merges them with history rows by the file’s annotator', async () => {
    const { lead, projectId, machineA, copyA } = await setup();
    await label(machineA, copyA, 'ana', 1, { tags: ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window'], intent: 'book_visit', status: 'done' });
    await label(machineA, copyA, 'ana', 2, { status: 'skipped' });
    await label(machineA, copyA, 'someone', 3, { status: 'done' });
    const back = await handBackMake(machineA, copyA, 'ana');
    expect(back.count).toBe(2);
    const read = await layersRead(back.text);
    expect(read.ok && read.file.layers.map((l) => [l.seq, l.externalId, l.tokenCount, l.status])).toEqual([[1, 'hr-001', 6, 'done'], [2, 'hr-002', 5, 'skipped']]);

    const summary = summaryOf(await layersMerge(lead, projectId, back.text));
    expect(summary).toEqual({ annotator: 'ana', received: 2, done: 1, skipped: 1, added: 2, replaced: 0, unchanged: 0, older: [], conflicts: [], newDisagreements: 0 });
    const key: LayerKey = [await idOfSeq(lead, projectId, 1), 'ana'];
    expect(await lead.layers.get(key)).toMatchObject({ intent: 'book_visit', status: 'done', revision: 1 });
    expect((await layerHistory(lead, key)).map((h) => [h.who, h.before, h.after.revision])).toEqual([['ana', null, 1]]);
    expect(await lead.annotators.get([projectId, 'ana'])).toBeDefined();
    expect((await packProgress(lead, projectId)).map((p) => [p.annotator, p.total, p.statuses])).toEqual([
      ['ana', 3, { unlabelled: 1, draft: 0, done: 1, skipped: 1, flagged: 0 }],
      ['ben', 3, { unlabelled: 3, draft: 0, done: 0, skipped: 0, flagged: 0 }],
    ]);

    // The same file again changes nothing at all.
    const dump = await dbDump(lead);
    expect(summaryOf(await layersMerge(lead, projectId, back.text))).toMatchObject({ received: 2, added: 0, replaced: 0, unchanged: 2 });
    expect(await dbDump(lead)).toEqual(dump);

    // A newer hand-back replaces; the older file afterwards is ignored and reported.
    await label(machineA, copyA, 'ana', 2, { status: 'done', intent: 'reschedule' });
    const newer = await handBackMake(machineA, copyA, 'ana');
    expect(summaryOf(await layersMerge(lead, projectId, newer.text))).toMatchObject({ replaced: 1, unchanged: 1, done: 2, skipped: 0 });
    expect((await layerHistory(lead, [await idOfSeq(lead, projectId, 2), 'ana'])).map((h) => [h.who, h.before?.revision ?? null, h.after.revision])).toEqual([
      ['ana', 1, 2],
      ['ana', null, 1],
    ]);
    const afterNewer = await dbDump(lead);
    expect(summaryOf(await layersMerge(lead, projectId, back.text))).toMatchObject({ older: [3], unchanged: 1, added: 0, replaced: 0 });
    expect(await dbDump(lead)).toEqual(afterNewer);
  });

  it('counts new disagreements between annotators on the overlap', async () => {
    const { lead, projectId, machineA, copyA, machineB, copyB } = await setup(true);
    const tags = ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window'];
    await label(machineA, copyA, 'ana', 1, { tags, intent: 'book_visit', status: 'done' });
    await label(machineA, copyA, 'ana', 3, { intent: 'ask_price', status: 'done' });
    await label(machineB, copyB, 'ben', 1, { tags: ['O', 'O', 'B-service', 'O', 'B-day', 'I-day'], intent: 'book_visit', status: 'done' });
    await label(machineB, copyB, 'ben', 3, { intent: 'ask_price', status: 'done' });
    await label(machineB, copyB, 'ben', 4, { status: 'done' });
    expect(summaryOf(await layersMerge(lead, projectId, (await handBackMake(machineA, copyA, 'ana')).text)).newDisagreements).toBe(0);
    // ben differs from ana on seq 1 only (I-day for B-time_window); seq 4 is ben's alone.
    expect(summaryOf(await layersMerge(lead, projectId, (await handBackMake(machineB, copyB, 'ben')).text))).toMatchObject({ received: 3, done: 3, newDisagreements: 1 });
  });

  it('refuses every bad file and changes nothing', async () => {
    const { lead, projectId, machineA, copyA } = await setup();
    await label(machineA, copyA, 'ana', 1, { status: 'done' });
    await label(machineA, copyA, 'ana', 2, { status: 'done' });
    const good = (await handBackMake(machineA, copyA, 'ana')).text;
    const uid = (await projectExchange(lead, projectId))?.uid ?? '';

    // Edited after writing: the line is named.
    const edited = good.replace('"status":"done"', '"status":"skipped"');
    expect(await refusedWithoutChange(lead, projectId, edited)).toEqual([{ line: 2, message: 'this line was changed after the file was written (its check does not match)' }]);
    // Corrupted: cut short.
    const cut = await refusedWithoutChange(lead, projectId, good.slice(0, good.length - 30));
    expect(cut[0]?.message).toMatch(/no check at its end/);
    // A pack is not a layer file.
    const pack = (await packsMake(lead, projectId, new Map([['ana', [1]]]))).at(0)?.text ?? '';
    expect((await refusedWithoutChange(lead, projectId, pack))[0]?.message).toBe('this is a Slotsmith pack, not a Slotsmith layer file');
    // Another project's file.
    const otherLead = dbTest({ factory: new IDBFactory() });
    const otherId = await master(otherLead);
    const [otherPack] = await packsMake(otherLead, otherId, new Map([['ana', [1]]]));
    const otherMachine = dbTest({ factory: new IDBFactory() });
    const otherCopy = await packOpen(otherMachine, otherPack?.text ?? '');
    if (!otherCopy.ok) throw new Error('unreadable');
    await label(otherMachine, otherCopy.projectId, 'ana', 1, { status: 'done' });
    const foreign = (await handBackMake(otherMachine, otherCopy.projectId, 'ana')).text;
    expect((await refusedWithoutChange(lead, projectId, foreign))[0]?.message).toMatch(/^this layer file belongs to another project \("Boiler jobs", fingerprint [0-9a-f]{8}…\), not this one$/);
    // Right project, but an unknown utterance and a token count that does not fit: the whole file is refused.
    const base = { seq: 1, externalId: 'hr-001', tokenCount: 6, annotator: 'ana', tags: ['O', 'O', 'O', 'O', 'O', 'O'], intent: null, status: 'done' as const, note: '', revision: 1, updated: 1 };
    const wrong = await layersWrite({
      created: 'x',
      project: { uid, name: 'Boiler jobs' },
      annotator: 'ana',
      layers: [base, { ...base, seq: 77, externalId: 'hr-077' }, { ...base, seq: 2, externalId: 'hr-002', tokenCount: 3, tags: ['O', 'O', 'O'] }],
    });
    expect(await refusedWithoutChange(lead, projectId, wrong)).toEqual([
      { line: 3, message: 'utterance 77 (hr-077) is not in this project' },
      { line: 4, message: 'utterance 2 (hr-002) has 5 tokens here but 3 in the file: it was tokenised differently' },
    ]);
    // A newer format version.
    const newer = good.replace('"version":1', '"version":2');
    expect((await refusedWithoutChange(lead, projectId, newer))[0]?.message).toMatch(/newer Slotsmith \(format version 2\)/);
    // A project that never handed out packs.
    const plain = await projectCreate(lead, { name: 'Garden jobs' });
    expect((await refusedWithoutChange(lead, plain.id, good))[0]?.message).toMatch(/has handed out no packs/);
    // And the good file still merges afterwards.
    expect(summaryOf(await layersMerge(lead, projectId, good)).added).toBe(2);
  });
});

describe('exchangeChoose', () => {
  it('chooses all, by layer filter, or a seeded sample, in project order', async () => {
    const db = dbTest();
    const projectId = await master(db);
    await projectSchemaSet(db, projectId, SCHEMA);
    expect(await exchangeChoose(db, projectId)).toEqual([1, 2, 3, 4]);
    await label(db, projectId, 'ana', 2, { status: 'skipped' });
    await label(db, projectId, 'ana', 3, { status: 'done' });
    expect(await exchangeChoose(db, projectId, { annotator: 'ana' })).toEqual([2, 3]);
    expect(await exchangeChoose(db, projectId, { annotator: 'ana', status: 'done' })).toEqual([3]);
    expect(await exchangeChoose(db, projectId, { annotator: 'ana', status: 'none' })).toEqual([1, 4]);
    expect(await exchangeChoose(db, projectId, { status: 'skipped' })).toEqual([2]);
    expect(await exchangeChoose(db, projectId, { status: 'done' })).toEqual([1, 2, 3, 4]);
    const sample = await exchangeChoose(db, projectId, { sample: { size: 2, seed: 7 } });
    expect(sample).toHaveLength(2);
    expect([...sample].sort((a, b) => a - b)).toEqual(sample);
    expect(await exchangeChoose(db, projectId, { sample: { size: 2, seed: 7 } })).toEqual(sample);
    const seeds = await Promise.all([1, 2, 3, 4, 5, 6].map((seed) => exchangeChoose(db, projectId, { sample: { size: 2, seed } })));
    expect(new Set(seeds.map((s) => s.join())).size).toBeGreaterThan(1);
  });
});
