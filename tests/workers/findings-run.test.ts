import { describe, expect, it } from 'vitest';
import { crfModelToJson, crfSequenceFromUtterance, crfTrain } from '../../src/core/crf';
import { findingKey, findingLocations, identicalFind, slotOutliersFind, variationFind, type LabelledUtterance } from '../../src/core/error-detect';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { layerSave } from '../../src/db/layer-repo';
import { projectModelSave } from '../../src/db/model-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { findingsAcrossUtterances, findingsLayersChoose, type LayerRef } from '../../src/workers/findings-choose';
import { FINDING_KINDS, findingsScan, LOCATIONS_SHOWN, type FindingsScanProgress } from '../../src/workers/findings-run';
import { dbTest, utteranceMake } from '../db/helpers';

type Status = 'done' | 'draft';
interface Planned {
  text: string;
  layers: { who: string; tags: string[]; status?: Status; intent?: string }[];
}

const DAY = (text: string, at: number, slot = 'day'): string[] => tokeniseWhitespace(text).map((_, i) => (i === at ? `B-${slot}` : 'O'));

/** An invented home-repair corpus with one planted slip of each text-level kind. */
function corpusPlan(): Planned[] {
  const plan: Planned[] = [];
  // "monday" as a day eleven times (one utterance per annotator layer), once as a time window.
  for (let i = 0; i < 11; i++) plan.push({ text: `move visit ${i} to monday`, layers: [{ who: 'ann-a', tags: DAY(`move visit ${i} to monday`, 4), intent: 'reschedule' }] });
  plan.push({ text: 'call me monday', layers: [{ who: 'ann-b', tags: DAY('call me monday', 2, 'time_window'), intent: 'reschedule' }] });
  // The same request twice, labelled differently by two people on two utterances.
  plan.push({ text: 'book a plumber for tuesday', layers: [{ who: 'ann-a', tags: ['O', 'O', 'B-service', 'O', 'B-day'], intent: 'book_visit' }] });
  plan.push({ text: 'book a plumber for tuesday', layers: [{ who: 'ann-b', tags: ['O', 'O', 'B-problem', 'O', 'B-day'], intent: 'book_visit' }] });
  // Two people disagree about one utterance only: the resolve screen's business, dropped here.
  plan.push({
    text: 'fix the boiler today',
    layers: [
      { who: 'ann-a', tags: ['O', 'O', 'B-problem', 'B-day'], intent: 'book_visit' },
      { who: 'ann-b', tags: ['O', 'O', 'B-service', 'B-day'], intent: 'book_visit' },
    ],
  });
  // Gold done: only gold is checked. Gold draft: the person's layer is checked.
  plan.push({
    text: 'the gutter on monday',
    layers: [
      { who: 'ann-a', tags: ['O', 'B-service', 'O', 'B-time_window'] },
      { who: 'gold', tags: ['O', 'B-service', 'O', 'B-day'] },
    ],
  });
  plan.push({
    text: 'the roofer on thursday',
    layers: [
      { who: 'ann-b', tags: ['O', 'B-service', 'O', 'B-day'] },
      { who: 'gold', tags: ['O', 'O', 'O', 'O'], status: 'draft' },
    ],
  });
  // Drafts and the model layer are never checked.
  plan.push({ text: 'book a plumber for tuesday', layers: [{ who: 'ann-a', tags: ['O', 'O', 'B-area', 'O', 'O'], status: 'draft' }, { who: 'model', tags: ['O', 'O', 'B-area', 'O', 'O'], status: 'draft' }] });
  return plan;
}

async function corpusStore(db: SlotsmithDb, plan: Planned[]): Promise<{ projectId: number; ids: number[] }> {
  const project = await projectCreate(db, { name: 'Home repairs' });
  const batchId = await batchBegin(db, project.id, { fileName: 'plan.txt', format: 'text' });
  await batchAppend(db, batchId, { utterances: plan.map((p) => utteranceMake(p.text)) });
  await batchFinish(db, batchId, { utterances: plan.length });
  const rows = await db.utterances.where('[projectId+seq]').between([project.id, 0], [project.id, Infinity]).toArray();
  const ids = rows.map((r) => r.id);
  for (const [i, p] of plan.entries()) {
    for (const l of p.layers) {
      await layerSave(db, [ids[i] as number, l.who], { tags: l.tags, status: l.status ?? 'done', intent: l.intent ?? null }, { expectedRevision: 0, who: l.who });
    }
  }
  return { projectId: project.id, ids };
}

/** The reference pool, built by hand from the plan with the rule the scan states (gold done, else people's done layers). */
function poolByHand(plan: Planned[], ids: number[]): LabelledUtterance[] {
  return plan.flatMap((p, i) => {
    const goldDone = p.layers.some((l) => l.who === 'gold' && (l.status ?? 'done') === 'done');
    return p.layers
      .filter((l) => (l.status ?? 'done') === 'done' && l.who !== 'model' && (goldDone ? l.who === 'gold' : l.who !== 'gold'))
      .map((l) => ({ id: String(ids[i]), layer: l.who, tokens: tokeniseWhitespace(p.text).map((t) => p.text.slice(t.start, t.end)), tags: l.tags, ...(l.intent === undefined ? {} : { intent: l.intent }) }));
  });
}

describe('findings layer choice', () => {
  it('takes a done gold layer alone, else every person’s done layer; never drafts or the model', () => {
    const refs: LayerRef[] = [
      { utteranceId: 2, annotator: 'ann-b', status: 'done' },
      { utteranceId: 2, annotator: 'ann-a', status: 'done' },
      { utteranceId: 1, annotator: 'gold', status: 'done' },
      { utteranceId: 1, annotator: 'ann-a', status: 'done' },
      { utteranceId: 3, annotator: 'gold', status: 'draft' },
      { utteranceId: 3, annotator: 'ann-a', status: 'done' },
      { utteranceId: 4, annotator: 'ann-a', status: 'flagged' },
      { utteranceId: 4, annotator: 'model', status: 'done' },
    ];
    expect(findingsLayersChoose(refs).map((r) => `${r.utteranceId}/${r.annotator}`)).toEqual(['1/gold', '2/ann-a', '2/ann-b', '3/ann-a']);
  });

  it('drops variation and identical findings confined to one utterance, keeps the others', () => {
    const one = (layer: string, tags: string[]): LabelledUtterance => ({ id: '7', layer, tokens: ['fix', 'the', 'boiler'], tags });
    const same = [one('ann-a', ['O', 'O', 'B-service']), one('ann-b', ['O', 'O', 'B-problem'])];
    const variation = variationFind(same);
    const identical = identicalFind(same);
    expect(variation.length).toBeGreaterThan(0);
    expect(identical).toHaveLength(1);
    expect(findingsAcrossUtterances([...variation, ...identical])).toEqual({ kept: [], dropped: variation.length + 1 });
    const spread = [...same, { ...one('ann-a', ['O', 'O', 'B-service']), id: '8' }];
    const kept = findingsAcrossUtterances(identicalFind(spread)).kept;
    expect(kept).toHaveLength(1);
    expect(new Set(findingLocations(kept[0]!).map((l) => l.id))).toEqual(new Set(['7', '8']));
  });
});

describe('findingsScan', () => {
  it('finds the planted slips, agrees with the core run on the hand-built pool, and reports progress', async () => {
    const db = dbTest();
    const plan = corpusPlan();
    const { projectId, ids } = await corpusStore(db, plan);
    const progress: FindingsScanProgress[] = [];
    const scan = await findingsScan(db, projectId, (p) => progress.push(p));

    const pool = poolByHand(plan, ids);
    expect(scan.layersChecked).toBe(pool.length);
    expect(scan.fromGold).toBe(1);
    expect(scan.fromPeople).toBe(pool.length - 1);
    expect(scan.utterancesChecked).toBe(new Set(pool.map((u) => u.id)).size);
    expect(scan.model).toEqual({ kind: 'none' });

    const expected = findingsAcrossUtterances([...variationFind(pool), ...identicalFind(pool), ...slotOutliersFind(pool)]);
    expect(scan.findings.map((f) => f.key)).toEqual(expected.kept.map(findingKey));
    expect(scan.sameUtteranceDropped).toBe(expected.dropped);
    expect(scan.sameUtteranceDropped).toBeGreaterThan(0);
    // Grouped by kind in the screen's order.
    const kinds = scan.findings.map((f) => FINDING_KINDS.indexOf(f.finding.kind));
    expect(kinds).toEqual([...kinds].sort((a, b) => a - b));

    const outlier = scan.findings.find((f) => f.finding.kind === 'slot-outlier')?.finding;
    expect(outlier).toMatchObject({ value: 'monday', slot: 'time_window', count: 1, majoritySlot: 'day', majorityCount: 12 });
    const identical = scan.findings.find((f) => f.finding.kind === 'identical')?.finding;
    expect(identical).toMatchObject({ tokens: ['book', 'a', 'plumber', 'for', 'tuesday'], occurrences: 2 });
    // The done gold layer stands for its utterance: ann-a's time_window on "the gutter on monday" is not counted.
    const places = scan.findings.flatMap((f) => findingLocations(f.finding));
    expect(places.some((l) => l.id === String(ids[15]) && l.layer === 'gold')).toBe(true);
    expect(places.some((l) => l.id === String(ids[15]) && l.layer === 'ann-a')).toBe(false);
    expect(places.every((l) => l.layer !== 'model')).toBe(true);
    // The first LOCATIONS_SHOWN places of each reading have their words at hand for the screen.
    const shown = scan.findings.flatMap(({ finding: f }) =>
      f.kind === 'variation' || f.kind === 'identical' ? f.readings.flatMap((r) => r.locations.slice(0, LOCATIONS_SHOWN)) : f.kind === 'slot-outlier' ? f.locations.slice(0, LOCATIONS_SHOWN) : [f.location],
    );
    expect(shown.length).toBeLessThan(places.length);
    for (const l of shown) expect(scan.utterances[l.id]?.words.length).toBeGreaterThan(l.end - 1);

    expect(progress.filter((p) => p.phase === 'reading').at(-1)).toEqual({ phase: 'reading', done: pool.length, total: pool.length });
    expect(progress.at(-1)).toEqual({ phase: 'checking', done: 4, total: 4 });
  });

  it('with a saved model, lists confident disagreements of the checked layers; an unreadable model is skipped with its reason', async () => {
    const db = dbTest();
    const plan = corpusPlan();
    const { projectId } = await corpusStore(db, plan);
    // Trained on the eleven "monday" days only, so "call me monday" as a time window goes against it.
    const training = plan
      .filter((p) => p.text.startsWith('move visit'))
      .flatMap((p) => p.layers.filter((l) => l.who === 'ann-a' && (l.status ?? 'done') === 'done').map((l) => crfSequenceFromUtterance({ text: p.text, tokens: tokeniseWhitespace(p.text), tags: l.tags })));
    const model = await crfTrain(training, { maxIterations: 100, c2: 0.001, seed: 3 });
    await projectModelSave(db, projectId, { json: crfModelToJson(model), origin: 'trained', crossValidation: null });
    const phases = new Set<string>();
    const scan = await findingsScan(db, projectId, (p) => phases.add(p.phase));
    expect(scan.model.kind).toBe('used');
    expect(phases).toEqual(new Set(['reading', 'tagging', 'checking']));
    const disagreements = scan.findings.filter((f) => f.finding.kind === 'model-disagreement').map((f) => f.finding);
    expect(disagreements.length).toBeGreaterThan(0);
    for (const d of disagreements) {
      if (d.kind !== 'model-disagreement') continue;
      expect(d.confidence).toBeGreaterThanOrEqual(0.9);
      expect(d.annotatorTags).not.toEqual(d.modelTags);
      expect(d.location.layer).not.toBe('model');
    }
    expect(disagreements.some((d) => d.kind === 'model-disagreement' && d.tokens.join(' ') === 'monday' && d.annotatorTags[0] === 'B-time_window' && d.modelTags[0] === 'B-day')).toBe(true);

    await projectModelSave(db, projectId, { json: '{"format":"something else"}', origin: 'file', crossValidation: null });
    const broken = await findingsScan(db, projectId);
    expect(broken.model.kind).toBe('unreadable');
    expect(broken.findings.some((f) => f.finding.kind === 'model-disagreement')).toBe(false);
    await expect(findingsScan(db, 999)).rejects.toThrow();
  });
});
