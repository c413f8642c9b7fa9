/**
 * The table's index made by an import (corpus-index-import.ts) on fake-indexeddb: it must equal the
 * index the table builds on its first visit, carry the project's signature after the import, and
 * never be taken as current once anything else was written.
 */
import { readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import type { FormatName } from '../../src/core/formats';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { corpusIndexBuild, corpusIndexSignature, corpusIndexUpdate, corpusSignatureSame } from '../../src/db/corpus-index';
import { CorpusIndexImport } from '../../src/db/corpus-index-import';
import { corpusIndexStoreOpen, type CorpusIndexStore } from '../../src/db/corpus-index-store';
import { corpusQueryRun, type CorpusFilter, type CorpusQuery } from '../../src/db/corpus-query';
import { CorpusService } from '../../src/db/corpus-service';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectSchemaSet } from '../../src/db/project-repo';
import { slotRename } from '../../src/db/schema-edit-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { ImportCancelledError } from '../../src/workers/import-read';
import { importCommit, schemaWithLabels, type CommitRequest } from '../../src/workers/import-run';
import { dbTest, utteranceMake } from './helpers';

const root = new URL('../../', import.meta.url);
const annA = readFileSync(new URL('sample-corpus/ann-a.iob2', root));
const annB = readFileSync(new URL('sample-corpus/ann-b.iob2', root));

const SCHEMA = { slots: [{ name: 'service' }, { name: 'day', intents: ['book_visit'] }], intents: [{ name: 'book_visit' }, { name: 'cancel' }] };
const INTENTS = ['book_visit', 'cancel', 'ask_price', 'reschedule'];

/**
 * Invented visit requests, enough for several import chunks (2,000) and build chunks (5,000): every
 * 7th has I-day after O (illegal IOB2), every 5th a budget slot the schema lacks, intents rotate.
 */
function visitsFile(count: number): Blob {
  let out = '';
  for (let i = 0; i < count; i++) {
    const day = i % 7 === 0 ? 'I-day' : 'B-day';
    const last = i % 5 === 0 ? 'B-budget' : 'O';
    out += `# id = v-${i}\n# intent = ${INTENTS[i % INTENTS.length]}\nplumber\tB-service\non\tO\nDay${i}\t${day}\nplease\t${last}\n\n`;
  }
  return new Blob([out]);
}

async function projectMake(db: SlotsmithDb): Promise<number> {
  return (await projectCreate(db, { name: 'Repairs', schema: SCHEMA })).id;
}

function commitRequest(projectId: number, format: FormatName, extra: Partial<CommitRequest> = {}): CommitRequest {
  return { projectId, format, fileName: `file.${format}`, total: 0, ...extra };
}

const query = (filter: CorpusFilter = {}, layer: string | null = 'ann-a'): CorpusQuery => ({ layer, filter, sort: { key: 'id', desc: false }, blind: false });
const PROBES: CorpusFilter[] = [{}, { violations: true }, { slot: 'budget' }, { intent: 'cancel' }, { status: 'done' }, { text: 'day12' }, { disagreement: true }];

async function storedOrNone(store: CorpusIndexStore, projectId: number) {
  return store.load(projectId);
}

describe('the table index saved by an import', () => {
  const cases: { name: string; file: () => Blob; request: (projectId: number) => CommitRequest }[] = [
    {
      name: 'a labelled file over several chunks, its labels added to the schema',
      file: () => visitsFile(4500),
      request: (projectId) => commitRequest(projectId, 'columns', { annotator: 'ann-a', total: 4500, labelsAdd: { slots: ['budget'], intents: ['ask_price'] } }),
    },
    { name: 'the sample corpus (ann-a)', file: () => new Blob([annA]), request: (projectId) => commitRequest(projectId, 'columns', { annotator: 'ann-a' }) },
    { name: 'plain text (no layers)', file: () => new Blob(['book a plumber for Friday\n\ncancel my visit\n\nhow much for a roofer\n']), request: (projectId) => commitRequest(projectId, 'text') },
  ];
  for (const c of cases) {
    it(`equals the index the table builds on its first visit: ${c.name}`, async () => {
      const db = dbTest();
      const store = corpusIndexStoreOpen(new IDBFactory());
      const projectId = await projectMake(db);
      await importCommit(db, c.file(), c.request(projectId), { indexStore: store });
      const saved = await storedOrNone(store, projectId);
      expect(saved).toBeDefined();
      const built = await corpusIndexBuild(db, projectId);
      // Everything: ids, codes, columns, texts, and the signature the table computes after the import.
      expect(saved).toEqual(built);
      expect(corpusSignatureSame(saved!.signature, await corpusIndexSignature(db, projectId))).toBe(true);
      // A first visit's worker answers from it without building.
      const service = new CorpusService(db, store, 0);
      for (const filter of PROBES) {
        const answer = await service.queryIfIndexed(projectId, query(filter));
        expect(answer?.index === 'stored' || answer?.index === 'reused').toBe(true);
        expect([...(answer?.ids ?? [])]).toEqual([...corpusQueryRun(built, query(filter))]);
      }
    });
  }

  it('a new page’s worker loads it ahead of the first question (warm), and warm never builds one', async () => {
    const db = dbTest();
    const store = corpusIndexStoreOpen(new IDBFactory());
    const projectId = await projectMake(db);
    const bare = await projectMake(db);
    await importCommit(db, new Blob([annA]), commitRequest(projectId, 'columns', { annotator: 'ann-a' }), { indexStore: store });
    await importCommit(db, new Blob([annA]), commitRequest(bare, 'columns', { annotator: 'ann-a' }));
    const service = new CorpusService(db, store, 0);
    expect(await service.warm(projectId)).toBe('stored');
    const answer = await service.queryIfIndexed(projectId, query({ violations: true }));
    expect(answer?.index).toBe('reused');
    expect([...(answer?.ids ?? [])]).toEqual([...corpusQueryRun(await corpusIndexBuild(db, projectId), query({ violations: true }))]);
    expect(await service.warm(bare)).toBeNull();
    expect(await service.queryIfIndexed(bare, query())).toBeNull();
    expect(await store.load(bare)).toBeUndefined();
  });

  it('a copy that cannot serve the project as it is now is loaded once, not again by the first question', async () => {
    const db = dbTest();
    const store = corpusIndexStoreOpen(new IDBFactory());
    const projectId = await projectMake(db);
    await importCommit(db, new Blob([annA]), commitRequest(projectId, 'columns', { annotator: 'ann-a' }), { indexStore: store });
    // A second annotator's file attaches layers: an import, so the copy can only be rebuilt.
    await importCommit(db, new Blob([annB]), commitRequest(projectId, 'columns', { annotator: 'ann-b' }), { indexStore: store });
    let loads = 0;
    const counting: CorpusIndexStore = { ...store, load: (id) => ((loads += 1), store.load(id)) };
    const service = new CorpusService(db, counting, 0);
    expect(await service.warm(projectId)).toBeNull();
    expect(await service.queryIfIndexed(projectId, query())).toBeNull();
    expect(loads).toBe(1);
    const built = await service.query(projectId, query({ annotator: 'ann-b' }));
    expect(built.index).toBe('built');
    expect([...built.ids]).toEqual([...corpusQueryRun(await corpusIndexBuild(db, projectId), query({ annotator: 'ann-b' }))]);
    expect(loads).toBe(1);
  });

  it('is not taken as current after a label edit (brought up to date), a slot rename or another import (rebuilt)', async () => {
    const db = dbTest();
    const store = corpusIndexStoreOpen(new IDBFactory());
    const projectId = await projectMake(db);
    await importCommit(db, visitsFile(300), commitRequest(projectId, 'columns', { annotator: 'ann-a', total: 300 }), { indexStore: store });
    const saved = await storedOrNone(store, projectId);
    expect(saved).toBeDefined();
    const first = saved!.ids[3] as number;
    await layerSave(db, [first, 'ann-a'], { status: 'flagged', tags: ['O', 'O', 'O', 'O'] }, { expectedRevision: 1, who: 'ann-a' });
    expect(corpusSignatureSame(saved!.signature, await corpusIndexSignature(db, projectId))).toBe(false);
    // A reload: the saved copy plus the edit from history, answering as a fresh build does.
    const edited = await new CorpusService(db, store, 0).query(projectId, query({ status: 'flagged' }));
    expect(edited.index).toBe('stored');
    expect([...edited.ids]).toEqual([first]);
    for (const filter of PROBES) {
      const fresh = corpusQueryRun(await corpusIndexBuild(db, projectId), query(filter));
      expect([...(await new CorpusService(db, store, 0).query(projectId, query(filter))).ids]).toEqual([...fresh]);
    }
    // A rename rewrites layers and the schema: the copy cannot be updated, it is built again.
    const copy = (await storedOrNone(store, projectId))!;
    await slotRename(db, projectId, 'service', 'trade', { who: 'lead' });
    expect(await corpusIndexUpdate(db, copy, await corpusIndexSignature(db, projectId))).toBe(false);
    const renamed = await new CorpusService(db, store, 0).query(projectId, query({ slot: 'trade' }));
    expect(renamed.index).toBe('built');
    // Every utterance had a service span but the one edited to all O.
    expect(renamed.ids.length).toBe(299);
    expect([...renamed.ids]).toEqual([...corpusQueryRun(await corpusIndexBuild(db, projectId), query({ slot: 'trade' }))]);
    // A second import into a project with utterances saves nothing of its own; the old copy is rejected.
    await new Promise((r) => setTimeout(r, 20));
    const before = await storedOrNone(store, projectId);
    await importCommit(db, new Blob(['gate hinge broken\n']), commitRequest(projectId, 'text', { total: 1 }), { indexStore: store });
    expect((await storedOrNone(store, projectId))?.signature).toEqual(before?.signature);
    const after = await new CorpusService(db, store, 0).query(projectId, query());
    expect(after.index).toBe('built');
    expect(after.total).toBe(301);
  });

  it('saves nothing after a cancelled import, or into a project that already had utterances', async () => {
    const db = dbTest();
    const store = corpusIndexStoreOpen(new IDBFactory());
    const projectId = await projectMake(db);
    let stored = 0;
    const cancelled = importCommit(db, visitsFile(5000), commitRequest(projectId, 'columns', { annotator: 'ann-a', total: 5000 }), {
      indexStore: store,
      onProgress: (p) => (stored = p.done),
      cancelled: () => stored >= 2000,
    });
    await expect(cancelled).rejects.toBeInstanceOf(ImportCancelledError);
    expect(await storedOrNone(store, projectId)).toBeUndefined();
    // The rolled-back batch stays listed; the next import still starts from an empty project and saves.
    await importCommit(db, new Blob([annA]), commitRequest(projectId, 'columns', { annotator: 'ann-a' }), { indexStore: store });
    const saved = await storedOrNone(store, projectId);
    expect(saved).toEqual(await corpusIndexBuild(db, projectId));
    const other = await projectMake(db);
    await importCommit(db, new Blob([annA]), commitRequest(other, 'columns', { annotator: 'ann-a' }));
    await importCommit(db, new Blob([annB]), commitRequest(other, 'columns', { annotator: 'ann-b' }), { indexStore: store });
    expect(await storedOrNone(store, other)).toBeUndefined();
  });
});

describe('CorpusIndexImport', () => {
  /** Begin, store one chunk, run `between`, finish: the index or null. */
  async function importWith(between: (db: SlotsmithDb, projectId: number, ids: number[]) => Promise<unknown>) {
    const db = dbTest();
    const projectId = await projectMake(db);
    const labels = { slots: ['budget'], intents: [] };
    const index = await CorpusIndexImport.start(db, projectId, { schemaFinal: (schema) => schemaWithLabels(schema, labels) });
    expect(index).not.toBeNull();
    const batchId = await batchBegin(db, projectId, { fileName: 'a.iob2', format: 'columns', annotator: 'ann-a' });
    const batch = (await db.batches.get(batchId))!;
    const utterances = [
      utteranceMake('book a plumber for Friday', ['O', 'O', 'B-service', 'O', 'B-day'], { id: 'hr-1', intent: 'book_visit' }),
      utteranceMake('cancel Monday please', ['O', 'I-day', 'O'], { id: 'hr-2', intent: 'cancel' }),
    ];
    const appended = await batchAppend(db, batchId, { utterances });
    index!.chunkAdd(batch, { utterances, ...appended });
    await projectSchemaSet(db, projectId, schemaWithLabels(SCHEMA, labels));
    await between(db, projectId, appended.utteranceIds);
    const done = await batchFinish(db, batchId, { utterances: 2 });
    return { db, projectId, made: await index!.finish(db, done) };
  }

  it('signs the index with the signature after the import when nothing else was written', async () => {
    const { db, projectId, made } = await importWith(async () => undefined);
    expect(made).not.toBeNull();
    expect(made).toEqual(await corpusIndexBuild(db, projectId));
  });

  it('gives nothing when a label edit, a schema change or another import came in between', async () => {
    const edit = await importWith((db, _p, ids) => layerSave(db, [ids[0] as number, 'ann-b'], { status: 'done' }, { expectedRevision: 0, who: 'ann-b' }));
    expect(edit.made).toBeNull();
    const schema = await importWith((db, projectId) => projectSchemaSet(db, projectId, { ...SCHEMA, intents: [...SCHEMA.intents, { name: 'reschedule' }] }));
    expect(schema.made).toBeNull();
    const other = await importWith(async (db, projectId) => {
      const batchId = await batchBegin(db, projectId, { fileName: 'b.txt', format: 'text' });
      await batchAppend(db, batchId, { utterances: [utteranceMake('gutter cleaning price')] });
    });
    expect(other.made).toBeNull();
  });

  it('does not start on a project with utterances', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const batchId = await batchBegin(db, projectId, { fileName: 'b.txt', format: 'text' });
    await batchAppend(db, batchId, { utterances: [utteranceMake('gutter cleaning price')] });
    expect(await CorpusIndexImport.start(db, projectId, { schemaFinal: (s) => s })).toBeNull();
  });
});
