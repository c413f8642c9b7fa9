import { readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LAYER_STATUSES, type LayerStatus } from '../../src/core/backup/model';
import { columnsRead } from '../../src/core/formats';
import { corpusIndexSignature, type CorpusSignature } from '../../src/db/corpus-index';
import { layerCopiesVisit, layerCopyPatched, LayerCopyBuilder, type LayerCopyRow } from '../../src/db/layer-copy';
import { bootstrapStoreOpen } from '../../src/db/bootstrap-store';
import { layerCopyStoreOpen } from '../../src/db/layer-copy-store';
import { layerSave } from '../../src/db/layer-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { layersScan } from '../../src/workers/agreement-read';
import { overviewRun } from '../../src/workers/agreement-overview';
import { agreementRun, type AgreementOutcome, type AgreementResult } from '../../src/workers/agreement-run';
import { LAYER_COPY_PATCH_MAX, layerCopiesFor } from '../../src/workers/layer-copies';
import { dbTest } from '../db/helpers';
import { agreementSeed } from './agreement-seed';

// The invented sample corpus (sample-corpus/README.md): ann-a and ann-b overlap on 400 utterances.
const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;

const SIGNATURE: CorpusSignature = { project: 'p', batches: '[]', historyLast: 0 };

async function seeded() {
  const db = dbTest();
  const seed = await agreementSeed(db, [
    { annotator: 'ann-a', utterances: A, statusOf: (_, i) => (i % 7 === 0 ? 'draft' : 'done') },
    { annotator: 'ann-b', utterances: B },
  ]);
  return { db, ...seed, store: layerCopyStoreOpen(new IDBFactory()) };
}

/** The rows a scan of the database gives, in its order, with the fields a copy keeps. */
async function scanned(db: SlotsmithDb, projectId: number, annotators: string[], statuses: LayerStatus[] | null): Promise<LayerCopyRow[]> {
  const rows: LayerCopyRow[] = [];
  await layersScan(db, { projectId, annotators, statuses }, ({ utteranceId, annotator, projectId: p, tags, intent, status, updated }) =>
    rows.push({ utteranceId, annotator, projectId: p, tags, intent, status, updated }),
  );
  return rows;
}

function visited(copies: Parameters<typeof layerCopiesVisit>[0], statuses: LayerStatus[] | null): LayerCopyRow[] {
  const rows: LayerCopyRow[] = [];
  layerCopiesVisit(copies, statuses, (row) => rows.push(row));
  return rows;
}

async function edit(db: SlotsmithDb, utteranceId: number, annotator: string, change: Parameters<typeof layerSave>[2]) {
  const row = await db.layers.get([utteranceId, annotator]);
  await layerSave(db, [utteranceId, annotator], change, { expectedRevision: row?.revision ?? 0, who: annotator });
}

function ok(outcome: AgreementOutcome): AgreementResult {
  if (!outcome.ok) throw new Error(outcome.message);
  return outcome;
}

describe('layer copies', () => {
  it('give back exactly the rows a scan of the database gives, in the same order, for any choice of statuses', async () => {
    const { db, projectId, store } = await seeded();
    const signature = await corpusIndexSignature(db, projectId);
    const got = await layerCopiesFor(db, store, projectId, ['ann-a', 'ann-b'], signature);
    expect(got.how).toEqual({ 'ann-a': 'read', 'ann-b': 'read' });
    for (const statuses of [null, ['done'], ['draft'], ['done', 'draft']] as (LayerStatus[] | null)[]) {
      expect(visited(got.copies, statuses)).toEqual(await scanned(db, projectId, ['ann-a', 'ann-b'], statuses));
    }
    await got.saved;
    // Stored and found again at the same signature, without reading a layer.
    const again = await layerCopiesFor(db, store, projectId, ['ann-a', 'ann-b'], signature);
    expect(again.how).toEqual({ 'ann-a': 'kept', 'ann-b': 'kept' });
    expect(visited(again.copies, null)).toEqual(visited(got.copies, null));
  });

  it('follow label edits through the history: patched copies equal a fresh read', async () => {
    const { db, projectId, idOf, store } = await seeded();
    await (await layerCopiesFor(db, store, projectId, ['ann-a', 'ann-b'], await corpusIndexSignature(db, projectId))).saved;
    const onlyA = A.find((u) => !B.some((b) => b.id === u.id));
    const shared = B.find((u) => u.tags.some((t) => t !== 'O'));
    const a0 = idOf.get(A[0]?.id ?? '') as number;
    const aOnly = idOf.get(onlyA?.id ?? '') as number;
    const s = idOf.get(shared?.id ?? '') as number;
    // Tags, intent and status changes; twice on one layer; and a new layer where ann-b had none.
    await edit(db, s, 'ann-b', { tags: (shared?.tags ?? []).map(() => 'O') });
    await edit(db, s, 'ann-b', { status: 'flagged', intent: 'cancel' });
    await edit(db, a0, 'ann-a', { status: 'skipped' });
    const tokens = (await db.layers.get([aOnly, 'ann-a']))?.tags.length ?? 0;
    await edit(db, aOnly, 'ann-b', { tags: Array.from({ length: tokens }, (_, i) => (i === 0 ? 'B-service' : 'O')), status: 'done' });
    const signature = await corpusIndexSignature(db, projectId);
    const got = await layerCopiesFor(db, store, projectId, ['ann-a', 'ann-b'], signature);
    expect(got.how).toEqual({ 'ann-a': 'patched', 'ann-b': 'patched' });
    expect(visited(got.copies, null)).toEqual(await scanned(db, projectId, ['ann-a', 'ann-b'], null));
    expect(got.copies.map((c) => c.signature)).toEqual([signature, signature]);
    await got.saved;
    expect((await layerCopiesFor(db, store, projectId, ['ann-a', 'ann-b'], signature)).how).toEqual({ 'ann-a': 'kept', 'ann-b': 'kept' });
  });

  it('are read in full again after a change to the project row (schema, imports) or more edits than a patch takes', async () => {
    const { db, projectId, store } = await seeded();
    await (await layerCopiesFor(db, store, projectId, ['ann-a'], await corpusIndexSignature(db, projectId))).saved;
    await db.projects.update(projectId, { updated: Date.UTC(2026, 0, 1) });
    const afterSchema = await layerCopiesFor(db, store, projectId, ['ann-a'], await corpusIndexSignature(db, projectId));
    expect(afterSchema.how).toEqual({ 'ann-a': 'read' });
    await afterSchema.saved;
    // Edits beyond the limit: the history rows are written straight in (as a merge of a big file would).
    const rows = await db.layers.where('[projectId+annotator+status]').between([projectId, 'ann-a', ''], [projectId, 'ann-a', '\uffff']).toArray();
    expect(rows.length).toBeGreaterThan(0);
    const history = Array.from({ length: LAYER_COPY_PATCH_MAX + 1 }, (_, i) => {
      const row = rows[i % rows.length];
      return { projectId, utteranceId: i < rows.length ? (row?.utteranceId ?? 0) : 1_000_000 + i, annotator: 'ann-a', before: null, after: { tags: row?.tags ?? [], intent: null, status: 'done' as const, note: '', revision: 2, updated: 0 }, who: 'ann-a', when: 0 };
    });
    await db.history.bulkAdd(history as never);
    const many = await layerCopiesFor(db, store, projectId, ['ann-a'], await corpusIndexSignature(db, projectId));
    expect(many.how).toEqual({ 'ann-a': 'read' });
    expect(visited(many.copies, null)).toEqual(await scanned(db, projectId, ['ann-a'], null));
  });

  it('an edit made while a copy is read is picked up by the next run (the copy keeps the signature from before)', async () => {
    const { db, projectId, idOf, store } = await seeded();
    const before = await corpusIndexSignature(db, projectId);
    const s = idOf.get(B[3]?.id ?? '') as number;
    await edit(db, s, 'ann-b', { status: 'flagged' });
    // Read with the older signature, as a run that started just before the edit would.
    await (await layerCopiesFor(db, store, projectId, ['ann-b'], before)).saved;
    const next = await layerCopiesFor(db, store, projectId, ['ann-b'], await corpusIndexSignature(db, projectId));
    expect(next.how).toEqual({ 'ann-b': 'patched' });
    expect(visited(next.copies, null)).toEqual(await scanned(db, projectId, ['ann-b'], null));
  });

  it('give the agreement (with kept bootstrap totals) and overview figures the rows give, before and after edits', async () => {
    const { db, projectId, idOf, store } = await seeded();
    const totals = bootstrapStoreOpen(new IDBFactory());
    const request = { projectId, annotators: ['ann-a', 'ann-b'], pair: ['ann-a', 'ann-b'] as [string, string], statuses: ['done'] as LayerStatus[], bootstrap: 40 };
    const shown = (r: AgreementResult) => ({ report: r.report, overTime: r.overTime, counted: r.counted, disagreements: r.disagreements });
    const runs = async () => {
      // The run stores its copies and totals before it answers (the page ends the worker then).
      const withCopies = ok(await agreementRun(db, request, undefined, { copies: store, totals }));
      const withRows = ok(await agreementRun(db, request));
      expect(shown(withCopies)).toEqual(shown(withRows));
      for (const source of [null, 'ann-b']) {
        const overview = { projectId, source, statuses: ['done', 'draft'] as LayerStatus[] };
        expect(await overviewRun(db, overview, undefined, store)).toEqual(await overviewRun(db, overview));
      }
      return withCopies;
    };
    const first = await runs();
    expect(first.timings.steps['copies read']).toBeDefined();
    const shared = B.find((u) => u.tags.some((t) => t !== 'O') && A.some((a) => a.id === u.id));
    await edit(db, idOf.get(shared?.id ?? '') as number, 'ann-b', { tags: (shared?.tags ?? []).map(() => 'O') });
    const second = await runs();
    expect(second.timings.steps['copies read']).toBeUndefined();
    // The intervals came from the kept totals, patched for the one edited utterance (and equal a fresh run's, above).
    expect(Object.keys(second.timings.steps)).toEqual(expect.arrayContaining(['totals kept (1 utterances changed)', 'totals patched']));
    expect(second.report.kappa.tag.value).not.toEqual(first.report.kappa.tag.value);
  });

  it('say which layers are missing, as the run without copies does', async () => {
    const { db, projectId, store } = await seeded();
    const request = { projectId, annotators: ['ann-a', 'ann-c'], pair: ['ann-a', 'ann-c'] as [string, string], statuses: ['done'] as LayerStatus[], bootstrap: 0 };
    expect(await agreementRun(db, request, undefined, { copies: store })).toEqual(await agreementRun(db, request));
  });
});

describe('layerCopyPatched', () => {
  // Random layers over utterance ids 1..40: patching any of them equals building from the result.
  const layer = fc.record({
    tags: fc.array(fc.constantFrom('O', 'B-day', 'I-day', 'B-area', 'I-area', 'E-x'), { maxLength: 6 }),
    intent: fc.option(fc.constantFrom('book_visit', 'cancel', 'ask_price'), { nil: null }),
    status: fc.constantFrom(...LAYER_STATUSES),
    updated: fc.integer({ min: 0, max: 1e12 }),
  });
  const layers = fc.dictionary(fc.integer({ min: 1, max: 40 }).map(String), layer);
  type Layer = { tags: string[]; intent: string | null; status: LayerStatus; updated: number };
  const build = (rows: Record<string, Layer>) => {
    const builder = new LayerCopyBuilder(1, 'ann-a');
    for (const id of Object.keys(rows).map(Number).sort((x, y) => x - y)) builder.rowAdd({ utteranceId: id, ...(rows[String(id)] as Layer) });
    return builder;
  };

  it('equals a copy built from the patched rows (fast-check)', () => {
    fc.assert(
      fc.property(layers, layers, fc.array(fc.integer({ min: 1, max: 40 }), { maxLength: 10 }), (base, changed, dropped) => {
        const copy = build(base).done(SIGNATURE);
        const touched = new Set([...Object.keys(changed).map(Number), ...dropped]);
        const after: typeof base = {};
        for (const [id, row] of Object.entries(base)) if (!touched.has(Number(id))) after[id] = row;
        for (const [id, row] of Object.entries(changed)) after[id] = row;
        const rows = Object.entries(changed).map(([id, row]) => ({ utteranceId: Number(id), annotator: 'ann-a', projectId: 1, ...row }));
        const patched = layerCopyPatched(copy, touched, rows, { ...SIGNATURE, historyLast: 9 });
        expect(visited([patched], null)).toEqual(visited([build(after).done(SIGNATURE)], null));
        expect(patched.signature.historyLast).toBe(9);
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('refuses rows out of utterance order', () => {
    const builder = new LayerCopyBuilder(1, 'ann-a');
    builder.rowAdd({ utteranceId: 5, tags: ['O'], intent: null, status: 'done', updated: 0 });
    expect(() => builder.rowAdd({ utteranceId: 5, tags: ['O'], intent: null, status: 'done', updated: 0 })).toThrow(/ascending utterance id/);
  });
});
