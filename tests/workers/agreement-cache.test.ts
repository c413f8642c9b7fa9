import { readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { columnsRead } from '../../src/core/formats';
import { agreementCacheOpen, AGREEMENT_CACHE_PER_PROJECT } from '../../src/db/agreement-cache';
import { bootstrapStoreOpen } from '../../src/db/bootstrap-store';
import { layerCopyStoreOpen } from '../../src/db/layer-copy-store';
import { bootstrapStoreRemembered, layerCopyStoreRemembered, WriteHold } from '../../src/workers/memory-stores';
import { corpusIndexSignature } from '../../src/db/corpus-index';
import { layerSave } from '../../src/db/layer-repo';
import { agreementRun, type AgreementOutcome, type AgreementRequest, type AgreementResult } from '../../src/workers/agreement-run';
import { dbTest } from '../db/helpers';
import { agreementSeed } from './agreement-seed';

// The invented sample corpus (sample-corpus/README.md): ann-a and ann-b overlap on 400 utterances.
const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;

function ok(outcome: AgreementOutcome): AgreementResult {
  if (!outcome.ok) throw new Error(outcome.message);
  return outcome;
}

const request = (projectId: number, extra: Partial<AgreementRequest> = {}): AgreementRequest => ({
  projectId,
  annotators: ['ann-a', 'ann-b'],
  pair: ['ann-a', 'ann-b'],
  statuses: ['done'],
  bootstrap: 50,
  ...extra,
});

/** What the screen shows, without the run's own timings and cache marker. */
function shown(result: AgreementResult) {
  const { timings: _t, keptFrom: _k, ...rest } = result;
  return rest;
}

async function seeded() {
  const db = dbTest();
  const seed = await agreementSeed(db, [
    { annotator: 'ann-a', utterances: A },
    { annotator: 'ann-b', utterances: B },
  ]);
  return { db, ...seed, cache: agreementCacheOpen<AgreementResult>(new IDBFactory()) };
}

describe('agreement results kept for unchanged layers', () => {
  it('a second run on unchanged layers gives the same figures from the cache, without reading the layers', async () => {
    const { db, projectId, cache } = await seeded();
    const first = ok(await agreementRun(db, request(projectId), undefined, { cache }));
    expect(first.keptFrom).toBeUndefined();
    const phases: string[] = [];
    const second = ok(await agreementRun(db, request(projectId), (p) => phases.push(p.phase), { cache }));
    expect(second.keptFrom).toEqual(expect.any(Number));
    expect(Object.keys(second.timings.steps)).toEqual(['cache']);
    expect(phases).toEqual([]);
    expect(shown(second)).toEqual(shown(first));
  });

  it('an edit, a status change or another choice of layers computes again, and the new figures follow the edit', async () => {
    const { db, projectId, idOf, cache } = await seeded();
    const before = ok(await agreementRun(db, request(projectId), undefined, { cache }));
    // Another request (other resamples, other statuses) is another entry.
    expect(ok(await agreementRun(db, request(projectId, { bootstrap: 20 }), undefined, { cache })).keptFrom).toBeUndefined();
    expect(ok(await agreementRun(db, request(projectId, { statuses: ['done', 'draft'] }), undefined, { cache })).keptFrom).toBeUndefined();
    // Change one of ann-b's shared utterances to all O: the token kappa must move.
    const shared = B.find((u) => u.tags.some((t) => t !== 'O') && A.some((a) => a.id === u.id));
    const utteranceId = idOf.get(shared?.id ?? '') as number;
    const row = await db.layers.get([utteranceId, 'ann-b']);
    await layerSave(db, [utteranceId, 'ann-b'], { tags: (row?.tags ?? []).map(() => 'O') }, { expectedRevision: row?.revision ?? 0, who: 'ann-b' });
    const after = ok(await agreementRun(db, request(projectId), undefined, { cache }));
    expect(after.keptFrom).toBeUndefined();
    expect(after.report.kappa.tag.value).not.toEqual(before.report.kappa.tag.value);
    // And the recomputed figures are kept in turn.
    expect(ok(await agreementRun(db, request(projectId), undefined, { cache })).report).toEqual(after.report);
  });

  it('"fresh" computes even when figures are kept, and replaces them', async () => {
    const { db, projectId, cache } = await seeded();
    ok(await agreementRun(db, request(projectId), undefined, { cache }));
    const fresh = ok(await agreementRun(db, request(projectId), undefined, { cache, fresh: true }));
    expect(fresh.keptFrom).toBeUndefined();
    expect(fresh.timings.steps).toHaveProperty('bootstrap');
    const kept = ok(await agreementRun(db, request(projectId), undefined, { cache }));
    expect(kept.keptFrom).toEqual(expect.any(Number));
    expect(shown(kept)).toEqual(shown(fresh));
  });

  it('with storeAfter the answer comes before the writes, which are handed over and then hold what a waiting run stores', async () => {
    const { db, projectId, cache } = await seeded();
    const copies = layerCopyStoreOpen(new IDBFactory());
    const totals = bootstrapStoreOpen(new IDBFactory());
    const handed: Promise<void>[] = [];
    const first = ok(await agreementRun(db, request(projectId), undefined, { cache, copies, totals, storeAfter: (w) => handed.push(w) }));
    expect(handed).toHaveLength(1);
    expect(first.timings.steps).not.toHaveProperty('stored');
    await handed[0];
    // Written: figures (the next run is a cache hit), copies at the signature and the totals of this choice.
    const again = ok(await agreementRun(db, request(projectId), undefined, { cache }));
    expect(again.keptFrom).toEqual(expect.any(Number));
    expect(shown(again)).toEqual(shown(first));
    const signature = await corpusIndexSignature(db, projectId);
    const stored = await copies.load(projectId, ['ann-a', 'ann-b']);
    expect([...stored.values()].map((c) => c.signature)).toEqual([signature, signature]);
    const fresh = ok(await agreementRun(db, request(projectId), undefined, { copies, totals, fresh: true }));
    expect(fresh.report).toEqual(first.report);
    // Without storeAfter the run waits for its writes, and says how long they took.
    expect(fresh.timings.steps).toHaveProperty('stored');
  });

  it('with storeAfter the figures are saved at once: a run right after finds them while the copies’ writes are still held', async () => {
    const { db, projectId, cache } = await seeded();
    const writes = new WriteHold();
    const copies = layerCopyStoreRemembered(layerCopyStoreOpen(new IDBFactory()), writes);
    const totals = bootstrapStoreRemembered(bootstrapStoreOpen(new IDBFactory()), writes);
    writes.hold();
    const handed: Promise<void>[] = [];
    const first = ok(await agreementRun(db, request(projectId), undefined, { cache, copies, totals, storeAfter: (w) => handed.push(w) }));
    const again = ok(await agreementRun(db, request(projectId), undefined, { cache, copies, totals, storeAfter: (w) => handed.push(w) }));
    expect(again.keptFrom).toEqual(expect.any(Number));
    expect(shown(again)).toEqual(shown(first));
    writes.release();
    await Promise.all(handed);
  });

  it('keeps the newest few results of a project, and ignores entries of another signature', async () => {
    let clock = 0;
    const cache = agreementCacheOpen<string>(new IDBFactory(), () => ++clock);
    const db = dbTest();
    const { projectId } = await agreementSeed(db, [{ annotator: 'ann-a', utterances: A.slice(0, 5) }]);
    const signature = await corpusIndexSignature(db, projectId);
    for (let i = 0; i <= AGREEMENT_CACHE_PER_PROJECT; i++) await cache.save(projectId, `k${i}`, signature, `result ${i}`);
    // The oldest went; the newest are there.
    expect(await cache.load(projectId, 'k0', signature)).toBeUndefined();
    expect((await cache.load(projectId, `k${AGREEMENT_CACHE_PER_PROJECT}`, signature))?.result).toBe(`result ${AGREEMENT_CACHE_PER_PROJECT}`);
    expect((await cache.load(projectId, 'k1', signature))?.result).toBe('result 1');
    expect(await cache.load(projectId + 1, 'k1', signature)).toBeUndefined();
    expect(await cache.load(projectId, 'k1', { ...signature, historyLast: signature.historyLast + 1 })).toBeUndefined();
  });
});
