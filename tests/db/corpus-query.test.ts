/**
 * The utterance table's query layer on fake-indexeddb: the index pass plus filters and sorts must
 * give exactly what a plain scan of the stored rows gives (corpusRowsRead is that scan, one row at a
 * time; a brute-force filter over it is the reference), and the service must notice edits.
 */
import fc from 'fast-check';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import type { LayerStatus, ProjectSchema } from '../../src/core/backup/model';
import { spansFromTags } from '../../src/core/schemes';
import type { Utterance } from '../../src/core/types';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { corpusIndexBuild } from '../../src/db/corpus-index';
import { CORPUS_SORT_KEYS, corpusQueryRun, type CorpusFilter, type CorpusQuery, type CorpusSortKey } from '../../src/db/corpus-query';
import { corpusRowsFirst, corpusRowsRead, type CorpusRow } from '../../src/db/corpus-rows';
import { corpusIndexStoreOpen } from '../../src/db/corpus-index-store';
import { CorpusService } from '../../src/db/corpus-service';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { dbTest, utteranceMake } from './helpers';

const SCHEMA: ProjectSchema = {
  slots: [
    { name: 'service', intents: ['book_visit', 'ask_price'] },
    { name: 'day' },
    { name: 'area' },
  ],
  intents: [{ name: 'book_visit' }, { name: 'ask_price' }, { name: 'cancel' }],
};

// Invented home-repair requests; the `ana` tags of hr-3 are illegal IOB2 (I-day after O), hr-4 uses a slot the schema lacks.
const ANA: Utterance[] = [
  utteranceMake('book a plumber for Friday', ['O', 'O', 'B-service', 'O', 'B-day'], { id: 'hr-1', intent: 'book_visit' }),
  utteranceMake('how much for an electrician', ['O', 'O', 'O', 'O', 'B-service'], { id: 'hr-2', intent: 'ask_price' }),
  utteranceMake('cancel Monday please', ['O', 'I-day', 'O'], { id: 'hr-3', intent: 'cancel' }),
  utteranceMake('roofer in Eastfield tomorrow', ['B-service', 'O', 'B-area', 'B-budget'], { id: 'hr-4', intent: 'book_visit' }),
];
// ben labels hr-1 the same, hr-2 with another intent, hr-5 alone.
const BEN: Utterance[] = [
  ANA[0] as Utterance,
  { ...(ANA[1] as Utterance), intent: 'book_visit' },
  utteranceMake('Plumber on Tuesday', ['B-service', 'O', 'B-day'], { id: 'hr-5', intent: 'book_visit' }),
];

async function fileImport(db: SlotsmithDb, projectId: number, annotator: string, utterances: Utterance[]): Promise<void> {
  const batchId = await batchBegin(db, projectId, { fileName: `${annotator}.iob2`, format: 'columns', annotator });
  await batchAppend(db, batchId, { utterances, attach: 'external-id' });
  await batchFinish(db, batchId, { utterances: utterances.length });
}

async function projectSample(db: SlotsmithDb): Promise<number> {
  const { id } = await projectCreate(db, { name: 'Repairs', schema: SCHEMA });
  await fileImport(db, id, 'ana', ANA);
  await fileImport(db, id, 'ben', BEN);
  // A text-only row with an intent from the file and no layer at all.
  const batchId = await batchBegin(db, id, { fileName: 'more.txt', format: 'text' });
  await batchAppend(db, batchId, { utterances: [utteranceMake('gutter cleaning price', undefined, { id: 'hr-6', intent: 'ask_price' })] });
  await batchFinish(db, batchId, { utterances: 1 });
  return id;
}

const query = (filter: CorpusFilter = {}, key: CorpusSortKey = 'id', desc = false, layer: string | null = 'ana', blind = false): CorpusQuery => ({
  layer,
  filter,
  sort: { key, desc },
  blind,
});

async function externalIds(db: SlotsmithDb, ids: Int32Array): Promise<string[]> {
  return (await db.utterances.bulkGet([...ids])).map((u) => u?.externalId ?? '?');
}

describe('corpus index and query', () => {
  it('filters by text, slot, intent, status, annotator, violations and disagreement', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const index = await corpusIndexBuild(db, projectId);
    expect(index.ids.length).toBe(6);
    expect(index.annotators).toEqual(['ana', 'ben']);
    const ids = async (filter: CorpusFilter, layer: string | null = 'ana', blind = false) => externalIds(db, corpusQueryRun(index, query(filter, 'id', false, layer, blind)));
    expect(await ids({})).toEqual(['hr-1', 'hr-2', 'hr-3', 'hr-4', 'hr-5', 'hr-6']);
    expect(await ids({ text: 'PLUMBER' })).toEqual(['hr-1', 'hr-5']);
    expect(await ids({ text: 'r f' })).toEqual(['hr-1']);
    expect(await ids({ text: 'nothing like it' })).toEqual([]);
    expect(await ids({ slot: 'service' })).toEqual(['hr-1', 'hr-2', 'hr-4']);
    expect(await ids({ slot: 'service' }, 'ben')).toEqual(['hr-1', 'hr-2', 'hr-5']);
    // hr-3's I-day opens a span too (lenient reading), so it has a day span.
    expect(await ids({ slot: 'day' })).toEqual(['hr-1', 'hr-3']);
    // Without an ana layer, hr-6 shows the file's intent.
    expect(await ids({ intent: 'ask_price' })).toEqual(['hr-2', 'hr-6']);
    expect(await ids({ intent: 'no_such_intent' })).toEqual([]);
    expect(await ids({ status: 'done' })).toEqual(['hr-1', 'hr-2', 'hr-3', 'hr-4']);
    expect(await ids({ status: 'unlabelled' })).toEqual(['hr-5', 'hr-6']);
    expect(await ids({ annotator: 'ben' })).toEqual(['hr-1', 'hr-2', 'hr-5']);
    // hr-3: I-day after O; hr-4: unknown slot budget.
    expect(await ids({ violations: true })).toEqual(['hr-3', 'hr-4']);
    expect(await ids({ disagreement: true })).toEqual(['hr-2']);
    // Blind mode ignores the disagreement filter rather than revealing anything through it.
    expect(await ids({ disagreement: true }, 'ana', true)).toEqual(['hr-1', 'hr-2', 'hr-3', 'hr-4', 'hr-5', 'hr-6']);
    expect(await ids({ slot: 'service', status: 'done', text: 'e' })).toEqual(['hr-1', 'hr-2', 'hr-4']);
    expect(await ids({}, null)).toHaveLength(6);
  });

  it('sorts by each key, ties in seq order, both directions', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const index = await corpusIndexBuild(db, projectId);
    const sorted = async (key: CorpusSortKey, desc = false) => externalIds(db, corpusQueryRun(index, query({}, key, desc)));
    expect(await sorted('id', true)).toEqual(['hr-6', 'hr-5', 'hr-4', 'hr-3', 'hr-2', 'hr-1']);
    expect(await sorted('text')).toEqual(['hr-1', 'hr-3', 'hr-6', 'hr-2', 'hr-5', 'hr-4']);
    // ask_price < book_visit < cancel; hr-5 has no ana layer and no file intent, so it sorts first.
    expect(await sorted('intent')).toEqual(['hr-5', 'hr-2', 'hr-6', 'hr-1', 'hr-4', 'hr-3']);
    expect(await sorted('status')).toEqual(['hr-5', 'hr-6', 'hr-1', 'hr-2', 'hr-3', 'hr-4']);
    expect(await sorted('violations', true)).toEqual(['hr-3', 'hr-4', 'hr-1', 'hr-2', 'hr-5', 'hr-6']);
    expect(await sorted('done', true)).toEqual(['hr-1', 'hr-2', 'hr-3', 'hr-4', 'hr-5', 'hr-6']);
  });

  it('reads pages of rows by id; blind rows carry no disagreement', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const index = await corpusIndexBuild(db, projectId);
    const rows = await corpusRowsRead(db, index.ids, { projectId, layer: 'ana', blind: false });
    expect(rows.map((r) => [r.externalId, r.intent, r.status, r.done, r.layers, r.violations, r.disagreement])).toEqual([
      ['hr-1', 'book_visit', 'done', 2, 2, 0, false],
      ['hr-2', 'ask_price', 'done', 2, 2, 0, true],
      ['hr-3', 'cancel', 'done', 1, 1, 1, false],
      ['hr-4', 'book_visit', 'done', 1, 1, 1, false],
      ['hr-5', null, 'unlabelled', 1, 1, 0, false],
      ['hr-6', 'ask_price', 'unlabelled', 0, 0, 0, false],
    ]);
    expect(rows[5]?.intentFromFile).toBe(true);
    expect(rows[0]?.tags).toEqual(ANA[0]?.tags);
    const blind = await corpusRowsRead(db, [index.ids[4] as number, index.ids[1] as number], { projectId, layer: 'ana', blind: true });
    // Order follows the ids asked for; ben's labels on hr-5 do not leak into ana's blind view.
    expect(blind.map((r) => [r.externalId, r.tags, r.intent, r.disagreement])).toEqual([
      ['hr-5', null, null, null],
      ['hr-2', ANA[1]?.tags, 'ask_price', null],
    ]);
  });

  it('reads the top rows of the plain table without the id list, as reading the first ids does', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const ids = (await corpusIndexBuild(db, projectId)).ids;
    for (const [layer, blind] of [['ana', false], ['ben', true], [null, false]] as const) {
      const context = { projectId, layer, blind };
      expect(await corpusRowsFirst(db, 4, context)).toEqual(await corpusRowsRead(db, ids.slice(0, 4), context));
      expect(await corpusRowsFirst(db, 50, context)).toEqual(await corpusRowsRead(db, ids, context));
    }
  });

  it('the service rebuilds after an edit and reuses the index otherwise', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const service = new CorpusService(db);
    const first = await service.query(projectId, query({ status: 'flagged' }));
    expect(first.ids.length).toBe(0);
    expect(first.total).toBe(6);
    expect(first.annotators).toEqual(['ana', 'ben']);
    expect(first.slots).toEqual(['area', 'budget', 'day', 'service']);
    expect(first.intents).toEqual(['ask_price', 'book_visit', 'cancel']);
    // Intent choices come from the shown layer only (ana's cancel is not offered when ben's layer is shown).
    expect((await service.query(projectId, query({}, 'id', false, 'ben', true))).intents).toEqual(['ask_price', 'book_visit']);
    expect(first.index).toBe('built');
    const again = await service.query(projectId, query({ status: 'done' }));
    expect(again.index).toBe('reused');
    expect(again.ids.length).toBe(4);
    const hr3 = (await db.utterances.where('[projectId+externalId]').equals([projectId, 'hr-3']).first())?.id as number;
    await layerSave(db, [hr3, 'ana'], { status: 'flagged', tags: ['O', 'B-day', 'O'] }, { expectedRevision: 1, who: 'ana' });
    const after = await service.query(projectId, query({ status: 'flagged' }));
    expect(after.index).toBe('updated');
    expect([...after.ids]).toEqual([hr3]);
    const violations = await service.query(projectId, query({ violations: true }));
    expect(await externalIds(db, violations.ids)).toEqual(['hr-4']);
    // A first layer by a new annotator is an edit too (one history row, one new layer).
    await layerSave(db, [hr3, 'cy'], { intent: 'cancel', status: 'done' }, { expectedRevision: 0, who: 'cy' });
    const withCy = await service.query(projectId, query({ annotator: 'cy' }));
    expect(withCy.index).toBe('updated');
    expect(withCy.annotators).toEqual(['ana', 'ben', 'cy']);
    expect([...withCy.ids]).toEqual([hr3]);
    // An import is not an edit: the index is built again.
    await fileImport(db, projectId, 'ana', [utteranceMake('fence panel blown down', undefined, { id: 'hr-7', intent: 'book_visit' })]);
    const imported = await service.query(projectId, query({}));
    expect(imported.index).toBe('built');
    expect(imported.total).toBe(7);
  });

  it('queryIfIndexed answers from a saved copy (or one in memory) and never builds one', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const store = corpusIndexStoreOpen(new IDBFactory());
    expect(await new CorpusService(db, store, 0).queryIfIndexed(projectId, query())).toBeNull();
    const built = await new CorpusService(db, store, 0).query(projectId, query({ slot: 'service' }));
    expect(built.index).toBe('built');
    for (let i = 0; i < 100 && (await store.load(projectId)) === undefined; i++) await new Promise((r) => setTimeout(r, 5));
    const saved = await new CorpusService(db, store, 0).queryIfIndexed(projectId, query({ slot: 'service' }));
    expect(saved?.index).toBe('stored');
    expect([...(saved?.ids ?? [])]).toEqual([...built.ids]);
    expect(saved?.total).toBe(built.total);
  });

  it('a saved copy serves a new service (a reload), brought up to date after edits, not after an import', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const store = corpusIndexStoreOpen(new IDBFactory());
    const saved = async () => {
      for (let i = 0; i < 100 && (await store.load(projectId)) === undefined; i++) await new Promise((r) => setTimeout(r, 5));
    };
    const first = await new CorpusService(db, store, 0).query(projectId, query({ slot: 'service' }));
    expect(first.index).toBe('built');
    await saved();
    const reloaded = await new CorpusService(db, store, 0).query(projectId, query({ slot: 'service' }));
    expect(reloaded.index).toBe('stored');
    expect([...reloaded.ids]).toEqual([...first.ids]);
    const hr5 = (await db.utterances.where('[projectId+externalId]').equals([projectId, 'hr-5']).first())?.id as number;
    await layerSave(db, [hr5, 'ana'], { tags: ['B-service', 'O', 'B-day'], intent: 'book_visit', status: 'done' }, { expectedRevision: 0, who: 'ana' });
    const edited = await new CorpusService(db, store, 0).query(projectId, query({ slot: 'service' }));
    expect(edited.index).toBe('stored');
    expect(await externalIds(db, edited.ids)).toEqual(['hr-1', 'hr-2', 'hr-4', 'hr-5']);
    expect([...edited.ids]).toEqual([...corpusQueryRun(await corpusIndexBuild(db, projectId), query({ slot: 'service' }))]);
    await fileImport(db, projectId, 'ben', [utteranceMake('gate hinge broken', undefined, { id: 'hr-8', intent: 'book_visit' })]);
    expect((await new CorpusService(db, store, 0).query(projectId, query())).index).toBe('built');
  });

  it('an index updated edit by edit answers like one built afresh (property)', async () => {
    const db = dbTest();
    const projectId = await projectSample(db);
    const service = new CorpusService(db);
    await service.query(projectId, query());
    const ids = [...(await corpusIndexBuild(db, projectId)).ids];
    const revisions = new Map<string, number>();
    for (const layer of await db.layers.toArray()) revisions.set(`${layer.utteranceId}|${layer.annotator}`, layer.revision);
    const edit = fc.record({
      at: fc.nat({ max: ids.length - 1 }),
      who: fc.constantFrom('ana', 'ben', 'gold'),
      status: fc.constantFrom(...STATUSES),
      intent: fc.constantFrom(...INTENTS),
      slot: fc.constantFrom('O', ...SLOTS.map((s) => `B-${s}`), 'I-day'),
    });
    await fc.assert(
      fc.asyncProperty(fc.array(edit, { minLength: 1, maxLength: 6 }), async (edits) => {
        for (const e of edits) {
          const id = ids[e.at] as number;
          const row = await db.utterances.get(id);
          const tags = new Array<string>((row?.tokens.length ?? 0) / 2).fill('O');
          tags[tags.length - 1] = e.slot;
          const key = `${id}|${e.who}`;
          const saved = await layerSave(db, [id, e.who], { tags, intent: e.intent, status: e.status }, { expectedRevision: revisions.get(key) ?? 0, who: e.who });
          revisions.set(key, saved.revision);
        }
        const answer = await service.query(projectId, query());
        expect(answer.index).toBe('updated');
        const fresh = await corpusIndexBuild(db, projectId);
        const probes: CorpusFilter[] = [{}, { status: 'done' }, { status: 'unlabelled' }, { violations: true }, { disagreement: true }, { slot: 'day' }, { intent: 'made_up' }, { annotator: 'gold' }];
        for (const filter of probes) {
          for (const key of CORPUS_SORT_KEYS) {
            const q = query(filter, key, true);
            expect([...(await service.query(projectId, q)).ids]).toEqual([...corpusQueryRun(fresh, q)]);
          }
        }
      }),
      { seed: 42, numRuns: 15 },
    );
  });
});

// Random projects: the indexed filters and sorts must agree with a brute-force pass over the rows.
const SLOTS = ['service', 'day', 'area', 'budget'];
const TAGS = ['O', 'O', 'O', ...SLOTS.flatMap((s) => [`B-${s}`, `I-${s}`])];
const WORDS = ['plumber', 'Friday', 'leak', 'Eastfield', 'price', 'boiler', 'tap', 'soon'];
const INTENTS = ['book_visit', 'ask_price', 'cancel', 'made_up'];
const STATUSES: LayerStatus[] = ['unlabelled', 'draft', 'done', 'skipped', 'flagged'];

const utteranceArb = fc.array(fc.constantFrom(...WORDS), { minLength: 1, maxLength: 5 }).chain((words) =>
  fc.record({
    words: fc.constant(words),
    ana: fc.option(fc.record({ tags: fc.array(fc.constantFrom(...TAGS), { minLength: words.length, maxLength: words.length }), intent: fc.constantFrom(...INTENTS), status: fc.constantFrom(...STATUSES) })),
    ben: fc.option(fc.record({ tags: fc.array(fc.constantFrom(...TAGS), { minLength: words.length, maxLength: words.length }), intent: fc.constantFrom(...INTENTS), status: fc.constantFrom(...STATUSES) })),
  }),
);

const filterArb: fc.Arbitrary<CorpusFilter> = fc.record(
  {
    text: fc.constantFrom('', 'p', 'LEAK', 'er f', 'zz'),
    slot: fc.constantFrom(...SLOTS),
    intent: fc.constantFrom(...INTENTS),
    status: fc.constantFrom(...STATUSES),
    annotator: fc.constantFrom('ana', 'ben'),
    violations: fc.boolean(),
    disagreement: fc.boolean(),
  },
  { requiredKeys: [] },
);

function rowPasses(row: CorpusRow, filter: CorpusFilter, byAnnotator: boolean): boolean {
  if (filter.text !== undefined && filter.text !== '' && !row.text.toLowerCase().includes(filter.text.toLowerCase())) return false;
  if (filter.slot !== undefined && !spansFromTags(row.tags ?? []).some((s) => s.slot === filter.slot)) return false;
  if (filter.intent !== undefined && row.intent !== filter.intent) return false;
  if (filter.status !== undefined && row.status !== filter.status) return false;
  if (filter.annotator !== undefined && !byAnnotator) return false;
  if (filter.violations === true && row.violations === 0) return false;
  if (filter.disagreement === true && row.disagreement !== true) return false;
  return true;
}

// Texts: lower case without accents by code unit (textSortKey's contract); intents: by the collator.
function textOrder(key: CorpusSortKey, a: string, b: string): number {
  if (key === 'intent') return new Intl.Collator(undefined, { sensitivity: 'base', numeric: true }).compare(a, b);
  const plain = (t: string) => t.normalize('NFD').replace(/\p{M}+/gu, '');
  return plain(a) < plain(b) ? -1 : plain(a) > plain(b) ? 1 : 0;
}

const STATUS_ORDER = Object.fromEntries(STATUSES.map((s, i) => [s, i]));
function rowKey(row: CorpusRow, key: CorpusSortKey): number | string {
  switch (key) {
    case 'id':
      return row.seq;
    case 'text':
      return row.text.toLowerCase();
    case 'intent':
      return row.intent ?? '';
    case 'status':
      return STATUS_ORDER[row.status] as number;
    case 'done':
      return row.done;
    case 'violations':
      return row.violations;
  }
}

describe('corpus query against a brute-force scan (property)', () => {
  it('gives the same ids in the same order', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(utteranceArb, { minLength: 1, maxLength: 25 }), filterArb, fc.constantFrom(...CORPUS_SORT_KEYS), fc.boolean(), async (items, filter, key, desc) => {
        const db = dbTest();
        const { id: projectId } = await projectCreate(db, { name: 'Random', schema: SCHEMA });
        const batchId = await batchBegin(db, projectId, { fileName: 'plain.txt', format: 'text' });
        const { utteranceIds } = await batchAppend(db, batchId, { utterances: items.map((item) => utteranceMake(item.words.join(' '))) });
        await batchFinish(db, batchId, { utterances: items.length });
        const has = { ana: new Set<number>(), ben: new Set<number>() };
        for (const [i, item] of items.entries()) {
          const id = utteranceIds[i] as number;
          for (const who of ['ana', 'ben'] as const) {
            const layer = item[who];
            if (layer === null) continue;
            await layerSave(db, [id, who], layer, { expectedRevision: 0, who });
            has[who].add(id);
          }
        }
        const index = await corpusIndexBuild(db, projectId);
        const got = [...corpusQueryRun(index, query(filter, key, desc))];
        const rows = await corpusRowsRead(db, utteranceIds, { projectId, layer: 'ana', blind: false });
        const sign = desc ? -1 : 1;
        const want = rows
          .filter((r) => rowPasses(r, filter, filter.annotator === undefined || has[filter.annotator as 'ana' | 'ben'].has(r.id)))
          .sort((a, b) => {
            const ka = rowKey(a, key);
            const kb = rowKey(b, key);
            if (key === 'id') return sign * (ka < kb ? -1 : ka > kb ? 1 : 0);
            const c = typeof ka === 'number' && typeof kb === 'number' ? ka - kb : textOrder(key, String(ka), String(kb));
            return sign * c || a.seq - b.seq;
          })
          .map((r) => r.id);
        expect(got).toEqual(want);
      }),
      { seed: 42, numRuns: 40 },
    );
  });
});
