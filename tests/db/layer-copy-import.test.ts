/**
 * Layer copies made or signed again by an import (layer-copy-import.ts) on fake-indexeddb: whatever
 * an import leaves stored at the project's signature must equal the copy layerCopiesFor builds by
 * reading every layer (it trusts a copy at the signature as it is), and an import that is not alone
 * in explaining the signature after it must leave nothing at that signature.
 */
import { readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { BATCH_BEGIN_LOCK } from '../../src/db/batch-cleanup';
import { corpusIndexSignature, corpusSignatureSame, type CorpusSignature } from '../../src/db/corpus-index';
import { LayerCopyImport } from '../../src/db/layer-copy-import';
import { layerCopiesVisit, layerCopyMerged, LayerCopyBuilder, type LayerCopy, type LayerCopyRow } from '../../src/db/layer-copy';
import { layerCopyStoreOpen, type LayerCopyStore } from '../../src/db/layer-copy-store';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { ImportCancelledError } from '../../src/workers/import-read';
import { importCommit, type CommitRequest, type ImportControl } from '../../src/workers/import-run';
import { layerCopiesFor } from '../../src/workers/layer-copies';
import { dbTest } from './helpers';

// The invented sample corpus (sample-corpus/README.md): ann-a and ann-b overlap on 400 utterances by id.
const root = new URL('../../', import.meta.url);
const annA = readFileSync(new URL('sample-corpus/ann-a.iob2', root), 'utf8');
const annB = readFileSync(new URL('sample-corpus/ann-b.iob2', root), 'utf8');

/** Invented visit requests over several import chunks (2,000), ids v-0…, with a slot the schema lacks. */
function visitsFile(count: number, annotator: string): string {
  let out = '';
  for (let i = 0; i < count; i++) {
    const day = i % 7 === 0 ? 'I-day' : 'B-day';
    const last = i % 5 === 0 ? 'B-budget' : 'O';
    out += `# id = v-${i}\n# intent = ${i % 3 === 0 ? 'cancel' : 'book_visit'}\n# annotator = ${annotator}\nplumber\tB-service\non\tO\nDay${i}\t${day}\nplease\t${last}\n\n`;
  }
  return out;
}

const ANNOTATORS = ['ann-a', 'ann-b', 'ann-c'];

async function projectMake(db: SlotsmithDb): Promise<number> {
  return (await projectCreate(db, { name: 'Repairs', schema: { slots: [{ name: 'service' }], intents: [{ name: 'book_visit' }] } })).id;
}

function request(projectId: number, annotator: string | undefined, extra: Partial<CommitRequest> = {}): CommitRequest {
  const base: CommitRequest = { projectId, format: annotator === undefined ? 'text' : 'columns', fileName: 'file', total: 0, ...extra };
  return annotator === undefined ? base : { ...base, annotator };
}

function rows(copy: LayerCopy): LayerCopyRow[] {
  const out: LayerCopyRow[] = [];
  layerCopiesVisit([copy], null, (row) => out.push(row));
  return out;
}

/** The copies layerCopiesFor builds by reading every layer, at the project's signature now. */
async function freshCopies(db: SlotsmithDb, projectId: number, annotators: string[]): Promise<{ signature: CorpusSignature; copies: Map<string, LayerCopy> }> {
  const signature = await corpusIndexSignature(db, projectId);
  const got = await layerCopiesFor(db, layerCopyStoreOpen(new IDBFactory()), projectId, annotators, signature, undefined, undefined, true);
  return { signature, copies: new Map(got.copies.filter((c) => c.utteranceIds.length > 0).map((c) => [c.annotator, c])) };
}

/**
 * Every copy stored at the project's signature equals a full read's: same rows decoded (codes may be
 * numbered differently when names first appear in another order) and, `exact`, the same arrays and tables.
 */
async function expectStoredExact(db: SlotsmithDb, store: LayerCopyStore, projectId: number, expected: { atSignature: string[]; exact?: string[] }): Promise<void> {
  const { signature, copies } = await freshCopies(db, projectId, ANNOTATORS);
  const stored = await store.load(projectId, ANNOTATORS);
  const current = [...stored.values()].filter((c) => corpusSignatureSame(c.signature, signature)).map((c) => c.annotator);
  expect(current.sort()).toEqual([...expected.atSignature].sort());
  for (const a of current) {
    const copy = stored.get(a) as LayerCopy;
    const read = copies.get(a) as LayerCopy;
    expect(read).toBeDefined();
    expect(rows(copy)).toEqual(rows(read));
    if (expected.exact?.includes(a) === true) expect(copy).toEqual(read);
  }
  // And the dashboard's own call takes them as they are.
  const run = await layerCopiesFor(db, store, projectId, current, signature);
  expect(Object.values(run.how).every((h) => h === 'kept')).toBe(true);
}

async function edit(db: SlotsmithDb, utteranceId: number, annotator: string, change: Parameters<typeof layerSave>[2]) {
  const row = await db.layers.get([utteranceId, annotator]);
  await layerSave(db, [utteranceId, annotator], change, { expectedRevision: row?.revision ?? 0, who: annotator });
}

async function setup() {
  const db = dbTest();
  const store = layerCopyStoreOpen(new IDBFactory());
  const projectId = await projectMake(db);
  const control: ImportControl = { copyStore: store };
  return { db, store, projectId, control };
}

describe('layer copies left by an import', () => {
  it('first annotator into an empty project: the copy equals a full read, arrays and tables alike', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a'], exact: ['ann-a'] });
  });

  it('over several chunks, with the file labels added to the schema', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([visitsFile(4500, 'ann-a')]), request(projectId, 'ann-a', { total: 4500, labelsAdd: { slots: ['day', 'budget'], intents: ['cancel'] } }), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a'], exact: ['ann-a'] });
  });

  it('second annotator attaching by external id: its copy is made and the first one signed again', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    const summary = await importCommit(db, new Blob([annB]), request(projectId, 'ann-b'), control);
    expect(summary.attached).toBe(400);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-b'], exact: ['ann-a'] });
  });

  it('a second annotator whose layers all attach, in another order than the utterance ids', async () => {
    const { db, store, projectId, control } = await setup();
    const a = visitsFile(3000, 'ann-a');
    await importCommit(db, new Blob([a]), request(projectId, 'ann-a'), control);
    // The same utterances, reversed and relabelled: every layer attaches, ids descending.
    const blocks = visitsFile(3000, 'ann-c').trim().split('\n\n').reverse();
    const relabelled = blocks.map((b, i) => (i % 4 === 0 ? b.replace('B-service', 'B-trade') : b)).join('\n\n') + '\n';
    await importCommit(db, new Blob([relabelled]), request(projectId, 'ann-c'), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-c'], exact: ['ann-a'] });
  });

  it("a re-import of the same annotator's file: refused (its layers are there), nothing signed", async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    const before = await store.load(projectId, ['ann-a']);
    await expect(importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control)).rejects.toThrow(/already has a layer/);
    expect(await store.load(projectId, ['ann-a'])).toEqual(before);
    await expectStoredExact(db, store, projectId, { atSignature: [] });
  });

  it("a re-import of the same annotator's file without ids: new utterances, merged into the stored copy", async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    await importCommit(db, new Blob([annB]), request(projectId, 'ann-b'), control);
    const withoutIds = annA.replace(/^# id = .*\n/gm, '');
    await importCommit(db, new Blob([withoutIds]), request(projectId, 'ann-a'), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-b'] });
  });

  it('an unlabelled import signs the stored copies again', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    await importCommit(db, new Blob([annB]), request(projectId, 'ann-b'), control);
    await importCommit(db, new Blob(['book a roofer for Monday\n\ncancel my visit\n']), request(projectId, undefined), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-b'], exact: ['ann-a'] });
  });

  it('a labelled import after label edits: copies behind by those edits are patched, then carried and merged', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    await importCommit(db, new Blob([annB]), request(projectId, 'ann-b'), control);
    const ids = (await db.layers.where('[projectId+annotator+status]').between([projectId, 'ann-a', ''], [projectId, 'ann-a', '\uffff']).limit(3).toArray()).map((l) => l.utteranceId);
    await edit(db, ids[0] as number, 'ann-a', { status: 'flagged', intent: 'cancel' });
    await edit(db, ids[1] as number, 'ann-b', { tags: (await db.layers.get([ids[1] as number, 'ann-a']))?.tags.map(() => 'O') ?? [], status: 'draft' });
    // No dashboard run since the edits: both stored copies are behind the signature by them.
    // ann-a's file again without ids: ann-a had layers; its copy, patched, takes the new ones.
    await importCommit(db, new Blob([annA.replace(/^# id = .*\n/gm, '')]), request(projectId, 'ann-a'), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-b'] });
    // An edit, a dashboard run that patches ann-b only, then an ann-c file: ann-a's copy is behind and patched at the import.
    await edit(db, ids[2] as number, 'ann-a', { status: 'skipped' });
    await (await layerCopiesFor(db, store, projectId, ['ann-b'], await corpusIndexSignature(db, projectId))).saved;
    await importCommit(db, new Blob([visitsFile(300, 'ann-c')]), request(projectId, 'ann-c'), control);
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-b', 'ann-c'], exact: ['ann-c'] });
  });

  it('without a way to patch, copies behind by edits are left, and the importing annotator with layers gets no copy', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    await importCommit(db, new Blob([annB]), request(projectId, 'ann-b'), control);
    const first = (await db.layers.where('[projectId+annotator+status]').between([projectId, 'ann-b', ''], [projectId, 'ann-b', '\uffff']).first())?.utteranceId as number;
    await edit(db, first, 'ann-b', { status: 'flagged' });
    await (await layerCopiesFor(db, store, projectId, ['ann-a'], await corpusIndexSignature(db, projectId))).saved;
    const copies = await LayerCopyImport.start(db, store, projectId, { annotator: 'ann-b', schemaFinal: (s) => s });
    expect(copies).not.toBeNull();
    expect(copies?.building).toBe(false);
    await importCommit(db, new Blob([annB.replace(/^# id = .*\n/gm, '')]), request(projectId, 'ann-b'), control);
    // With the app's patch (importCommit's), ann-b's copy was patched and merged all the same.
    await expectStoredExact(db, store, projectId, { atSignature: ['ann-a', 'ann-b'] });
  });

  it('an edit during the import: nothing is signed with the signature after it', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    const edited = (await db.layers.where('[projectId+annotator+status]').between([projectId, 'ann-a', ''], [projectId, 'ann-a', '\uffff']).first())?.utteranceId as number;
    // The batch lock is taken after the import looked at the project: edit right then, as another tab could.
    const lock: NonNullable<ImportControl['lock']> = async (name, work) => {
      if (name !== BATCH_BEGIN_LOCK) await edit(db, edited, 'ann-a', { status: 'skipped' });
      return work();
    };
    await importCommit(db, new Blob([annB]), request(projectId, 'ann-b'), { ...control, lock });
    expect((await db.history.where('projectId').equals(projectId).count()) > 0).toBe(true);
    await expectStoredExact(db, store, projectId, { atSignature: [] });
    // The copy of ann-a stays at its old signature; the next run reads both in full, as without import copies.
    const run = await layerCopiesFor(db, store, projectId, ['ann-a', 'ann-b'], await corpusIndexSignature(db, projectId));
    expect(run.how).toEqual({ 'ann-a': 'read', 'ann-b': 'read' });
  });

  it('a cancelled import saves nothing', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    const before = await store.load(projectId, ANNOTATORS);
    let chunks = 0;
    const cancelled = () => chunks++ > 0;
    await expect(importCommit(db, new Blob([visitsFile(4500, 'ann-b')]), request(projectId, 'ann-b'), { ...control, cancelled })).rejects.toThrow(ImportCancelledError);
    expect(await store.load(projectId, ANNOTATORS)).toEqual(before);
  });

  it('copies are per project: an import into another project leaves this one as it was', async () => {
    const { db, store, projectId, control } = await setup();
    await importCommit(db, new Blob([annA]), request(projectId, 'ann-a'), control);
    const other = await projectMake(db);
    await importCommit(db, new Blob([annB]), request(other, 'ann-b'), control);
    expect([...(await store.load(other, ANNOTATORS)).keys()]).toEqual(['ann-b']);
    expect([...(await store.load(projectId, ANNOTATORS)).keys()]).toEqual(['ann-a']);
  });
});

describe('layerCopyMerged', () => {
  const build = (layers: [number, string[], string | null][], anyOrder = false) => {
    const b = new LayerCopyBuilder(1, 'ann-a', undefined, anyOrder);
    for (const [utteranceId, tags, intent] of layers) b.rowAdd({ utteranceId, tags, intent, status: 'done', updated: utteranceId });
    return b.done({ project: 'p', batches: '[]', historyLast: 0 });
  };
  const SIG = { project: 'p', batches: '[1]', historyLast: 0 };

  it('orders added layers, replaces the base layer on the same utterance, and keeps the base codes', () => {
    const base = build([
      [2, ['O', 'B-day'], 'cancel'],
      [5, ['B-service'], null],
    ]);
    const added = build(
      [
        [9, ['B-area', 'I-area'], 'ask_price'],
        [1, ['O'], null],
        [5, ['O', 'B-day'], 'cancel'],
      ],
      true,
    );
    const merged = layerCopyMerged(base, added, SIG);
    expect(Array.from(merged.utteranceIds)).toEqual([1, 2, 5, 9]);
    expect(merged.tagNames.slice(0, base.tagNames.length)).toEqual(base.tagNames);
    const expected = build([
      [1, ['O'], null],
      [2, ['O', 'B-day'], 'cancel'],
      [5, ['O', 'B-day'], 'cancel'],
      [9, ['B-area', 'I-area'], 'ask_price'],
    ]);
    expect(rows(merged)).toEqual(rows(expected));
    expect(merged.signature).toEqual(SIG);
  });

  it('into no base gives the tables a read in utterance order gives', () => {
    const added = build(
      [
        [7, ['B-x'], 'b'],
        [3, ['B-y', 'O'], 'a'],
      ],
      true,
    );
    const merged = layerCopyMerged(null, added, SIG);
    expect(merged).toEqual({
      ...build([
        [3, ['B-y', 'O'], 'a'],
        [7, ['B-x'], 'b'],
      ]),
      signature: SIG,
    });
  });

  it('refuses two added layers on one utterance', () => {
    const added = build(
      [
        [4, ['O'], null],
        [4, ['O'], null],
      ],
      true,
    );
    expect(() => layerCopyMerged(null, added, SIG)).toThrow(/added twice/);
  });
});
