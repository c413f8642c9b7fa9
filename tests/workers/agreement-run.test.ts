import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { agreementCompute, layersAlign, type AgreementReport, type AlignedCorpus } from '../../src/core/agreement';
import { columnsRead } from '../../src/core/formats';
import type { Utterance } from '../../src/core/types';
import { agreementRun, type AgreementOutcome, type AgreementRequest, type AgreementResult } from '../../src/workers/agreement-run';
import { dbTest } from '../db/helpers';
import { agreementSeed } from './agreement-seed';

// The invented sample corpus (sample-corpus/README.md): ann-a and ann-b overlap on 400 utterances.
const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;
const TRUTH = columnsRead(readFileSync('sample-corpus/truth.iob2')).utterances;
const overlap = new Set(readFileSync('sample-corpus/overlap-ids.txt', 'utf8').split(/\r?\n/).filter((l) => l !== ''));
// Fewer resamples than the default keep the suite quick; equality with the file path holds for any count.
const RESAMPLES = 200;

/** The reference: the command line's path (files aligned by id, then `agreementCompute`). */
function fromFiles(layers: { name: string; utterances: readonly Utterance[] }[], pair: [number, number] = [0, 1]): { report: AgreementReport; corpus: AlignedCorpus } {
  const aligned = layersAlign(layers.map((l) => ({ ...l, scheme: 'iob2' as const })), { by: 'id' });
  if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
  return { report: agreementCompute(aligned.corpus, { bootstrap: RESAMPLES, layers: pair }), corpus: aligned.corpus };
}

function ok(outcome: AgreementOutcome): AgreementResult {
  if (!outcome.ok) throw new Error(outcome.message);
  return outcome;
}

/** Every figure but the layer names and the ids (database ids in the app, file ids in the reference). */
function figures(report: AgreementReport) {
  const { layers: _layers, pairNames: _names, disagreements, ...rest } = report;
  return { ...rest, disagreements: { total: disagreements.total, items: disagreements.items.map((d) => ({ ...d, id: null, line: 0, lineB: 0 })) } };
}

const request = (projectId: number, extra: Partial<AgreementRequest> = {}): AgreementRequest => ({
  projectId,
  annotators: ['ann-a', 'ann-b'],
  pair: ['ann-a', 'ann-b'],
  statuses: ['done'],
  bootstrap: RESAMPLES,
  ...extra,
});

describe('agreementRun on the sample corpus', () => {
  it('gives exactly the figures of the file path (same core, same order, same bootstrap)', async () => {
    const db = dbTest();
    const { projectId, idOf } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A },
      { annotator: 'ann-b', utterances: B },
    ]);
    const early: AgreementResult[] = [];
    const got = ok(await agreementRun(db, request(projectId), undefined, { onPoint: (e) => early.push(e) }));
    // The early result is the final one but for the intervals, still to come.
    expect(early).toHaveLength(1);
    expect(early[0]?.intervalsPending).toBe(true);
    expect(got.intervalsPending).toBe(false);
    expect({ ...early[0]?.report, ci: 'later' }).toEqual({ ...got.report, ci: 'later' });
    expect(early[0]?.report.ci).toBeNull();
    expect(early[0]?.disagreements).toEqual(got.disagreements);
    const want = fromFiles([
      { name: 'ann-a', utterances: A },
      { name: 'ann-b', utterances: B },
    ]).report;
    expect(got.report.utterances).toBe(overlap.size);
    expect(figures(got.report)).toEqual(figures(want));
    expect(got.report.pairNames).toEqual(['ann-a', 'ann-b']);
    // The listed utterances are the same ones, named by database id, with their text.
    const byFileId = new Map(A.map((u) => [u.id, u]));
    expect(got.disagreements.map((d) => d.utteranceId)).toEqual(want.disagreements.items.map((d) => idOf.get(d.id ?? '')));
    for (const d of got.disagreements.slice(0, 10)) expect(d.text).toBe(byFileId.get(d.externalId)?.text);
    expect(got.counted).toEqual([
      { annotator: 'ann-a', layers: A.length, statuses: { done: A.length } },
      { annotator: 'ann-b', layers: B.length, statuses: { done: B.length } },
    ]);
    expect(got.statuses).toEqual(['done']);
    // One completion time for all: one point, the whole figure.
    expect(got.overTime).toEqual([{ time: Date.UTC(2025, 2, 14), utterances: overlap.size, tokens: want.tokens, kappa: want.kappa.slot.value }]);
  });

  it('counts only the chosen statuses, and drafts when asked', async () => {
    const db = dbTest();
    const draft = new Set([...overlap].slice(0, 120));
    const { projectId } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A },
      { annotator: 'ann-b', utterances: B, statusOf: (u) => (draft.has(u.id ?? '') ? 'draft' : 'done') },
    ]);
    const doneOnly = ok(await agreementRun(db, request(projectId)));
    const wantDone = fromFiles([
      { name: 'ann-a', utterances: A },
      { name: 'ann-b', utterances: B.filter((u) => !draft.has(u.id ?? '')) },
    ]).report;
    expect(doneOnly.report.utterances).toBe(overlap.size - draft.size);
    expect(figures(doneOnly.report)).toEqual(figures(wantDone));
    expect(doneOnly.counted[1]).toEqual({ annotator: 'ann-b', layers: B.length - draft.size, statuses: { done: B.length - draft.size } });

    const withDrafts = ok(await agreementRun(db, request(projectId, { statuses: ['done', 'draft'] })));
    const wantAll = fromFiles([
      { name: 'ann-a', utterances: A },
      { name: 'ann-b', utterances: B },
    ]).report;
    expect(figures(withDrafts.report)).toEqual(figures(wantAll));
    expect(withDrafts.counted[1]?.statuses).toEqual({ done: B.length - draft.size, draft: draft.size });
  });

  it('adds Fleiss, Krippendorff and the pairwise matrix with three annotators', async () => {
    const db = dbTest();
    const C = TRUTH.filter((u) => overlap.has(u.id ?? ''));
    const { projectId } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A },
      { annotator: 'ann-b', utterances: B },
      { annotator: 'ann-c', utterances: C },
    ]);
    const got = ok(await agreementRun(db, request(projectId, { annotators: ['ann-a', 'ann-b', 'ann-c'], pair: ['ann-b', 'ann-c'] })));
    const want = fromFiles(
      [
        { name: 'ann-a', utterances: A },
        { name: 'ann-b', utterances: B },
        { name: 'ann-c', utterances: C },
      ],
      [1, 2],
    ).report;
    expect(got.report.fleissKappa).toEqual(want.fleissKappa);
    expect(got.report.alpha).toEqual(want.alpha);
    expect(got.report.pairwise?.kappa).toEqual(want.pairwise?.kappa);
    expect(got.report.pairwise?.layers).toEqual(['ann-a', 'ann-b', 'ann-c']);
    expect(figures(got.report)).toEqual(figures(want));
    expect(got.report.fleissKappa?.slot.utterances).toBe(overlap.size);
  });

  it('follows agreement over time by the later of the two layers’ times', async () => {
    const db = dbTest();
    const shared = A.filter((u) => overlap.has(u.id ?? ''));
    const day = (i: number) => Date.UTC(2025, 2, 1 + (i % 10));
    const dayOf = new Map(shared.map((u, i) => [u.id, day(i)]));
    const { projectId } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A, updatedOf: () => Date.UTC(2025, 1, 1) },
      { annotator: 'ann-b', utterances: B, updatedOf: (u) => dayOf.get(u.id) ?? Date.UTC(2025, 1, 1) },
    ]);
    const got = ok(await agreementRun(db, request(projectId, { bootstrap: 0 })));
    // Ten distinct days, fewer than the point limit: one point per day, none splitting a day.
    expect(got.overTime.map((p) => p.time)).toEqual(Array.from({ length: 10 }, (_, i) => Date.UTC(2025, 2, 1 + i)));
    expect(got.overTime.at(-1)?.kappa).toBe(got.report.kappa.slot.value);
    // The point of day 4 is the slot kappa of exactly the utterances ann-b finished by then.
    const byDay4 = B.filter((u) => (dayOf.get(u.id) ?? Infinity) <= Date.UTC(2025, 2, 4));
    const want = fromFiles([
      { name: 'ann-a', utterances: A },
      { name: 'ann-b', utterances: byDay4 },
    ]).report;
    const point = got.overTime[3];
    expect(point?.utterances).toBe(want.utterances);
    expect(point?.tokens).toBe(want.tokens);
    expect(point?.kappa).toBeCloseTo(want.kappa.slot.value ?? Number.NaN, 12);
  });

  it('refuses requests it cannot answer, in words', async () => {
    const db = dbTest();
    const { projectId } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A.slice(0, 20) },
      { annotator: 'ann-b', utterances: B.slice(0, 20), statusOf: () => 'draft' },
    ]);
    const none = await agreementRun(db, request(projectId));
    expect(none).toEqual({ ok: false, message: 'No layers of ann-b with status done: nothing to compare.' });
    expect(await agreementRun(db, request(projectId, { annotators: ['ann-a'], pair: ['ann-a', 'ann-a'] }))).toMatchObject({ ok: false });
    expect(await agreementRun(db, request(projectId, { pair: ['ann-a', 'ann-c'] }))).toMatchObject({ ok: false, message: 'The compared pair must be among the chosen layers.' });
    expect(await agreementRun(db, request(projectId, { statuses: [] }))).toMatchObject({ ok: false });
  });

  it('reports progress from reading to the last resample', async () => {
    const db = dbTest();
    const { projectId } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A },
      { annotator: 'ann-b', utterances: B },
    ]);
    const seen: string[] = [];
    ok(await agreementRun(db, request(projectId, { bootstrap: 250 }), (p) => seen.push(`${p.phase} ${p.done}/${p.total}`)));
    // Reading runs over the span of utterance ids (the seed stores 2,000, contiguous).
    expect(seen[0]).toBe(`reading 0/2000`);
    expect(seen).toContain('reading 2000/2000');
    expect(seen.filter((s) => s.startsWith('intervals'))).toEqual(['intervals 0/250', 'intervals 100/250', 'intervals 200/250']);
  });
});
