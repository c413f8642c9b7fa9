import { describe, expect, it } from 'vitest';
import { crfModelFromJson } from '../../src/core/crf';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { layerHistory, layerSave } from '../../src/db/layer-repo';
import {
  leastConfidenceFromNote,
  leastConfidenceNote,
  modelLayersWrite,
  modelQueue,
  modelTrainingSet,
  modelUnlabelled,
  projectModel,
  projectModelSave,
} from '../../src/db/model-repo';
import { projectCreate } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { crfRunnerCreate } from '../../src/workers/crf-run';
import { dbTest, SAMPLE } from './helpers';

/** The four sample utterances (seqs 1–4) with no layers; returns the project id and utterance ids by seq. */
async function bare(db: SlotsmithDb, scheme: 'iob2' | 'bioes' = 'iob2'): Promise<{ projectId: number; ids: number[] }> {
  const project = await projectCreate(db, { name: 'Boiler jobs', scheme });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
  await batchAppend(db, batchId, { utterances: SAMPLE });
  await batchFinish(db, batchId, { utterances: SAMPLE.length });
  const rows = await db.utterances.where('[projectId+seq]').between([project.id, 0], [project.id, Infinity]).toArray();
  return { projectId: project.id, ids: rows.map((r) => r.id) };
}

const tagsOf = (i: number) => [...(SAMPLE[i]?.tags ?? [])];

describe('model-repo', () => {
  it('keeps the model in the project row without touching its other fields, and forgets it on null', async () => {
    const db = dbTest();
    const { projectId } = await bare(db);
    expect(await projectModel(db, projectId)).toBeNull();
    const before = await db.projects.get(projectId);
    const saved = await projectModelSave(db, projectId, { json: '{"x":1}', origin: 'file', crossValidation: null });
    expect(saved?.json).toBe('{"x":1}');
    expect(await projectModel(db, projectId)).toEqual(saved);
    const after = await db.projects.get(projectId);
    expect({ ...after, model: undefined }).toEqual({ ...before, model: undefined });
    await projectModelSave(db, projectId, null);
    expect(await projectModel(db, projectId)).toBeNull();
    expect(await db.projects.get(projectId)).toEqual(before);
    await expect(projectModel(db, 999)).rejects.toThrow();
  });

  it('trains from gold where present, else the done layer of the first annotator; drafts and the model layer never count', async () => {
    const db = dbTest();
    const { projectId, ids } = await bare(db);
    const [a, b, c, d] = ids as [number, number, number, number];
    const save = (id: number, who: string, tags: string[], status: 'done' | 'draft') => layerSave(db, [id, who], { tags, status }, { expectedRevision: 0, who });
    await save(a, 'ann-b', tagsOf(0), 'done');
    await save(a, 'ann-a', tagsOf(0).map(() => 'O'), 'done');
    await save(b, 'ann-a', tagsOf(1), 'done');
    await save(b, 'gold', ['O', 'O', 'O', 'B-day', 'O'], 'done');
    await save(c, 'ann-a', tagsOf(2), 'draft');
    await save(d, 'model', tagsOf(3), 'draft');
    const set = await modelTrainingSet(db, projectId);
    expect(set.utteranceIds).toEqual([a, b]);
    expect(set).toMatchObject({ fromGold: 1, fromDone: 1 });
    // ann-a (alphabetically first) wins on a; gold wins on b.
    expect(set.sequences[0]?.tags).toEqual(['O', 'O', 'O', 'O', 'O', 'O']);
    expect(set.sequences[1]).toEqual({ words: ['move', 'it', 'to', 'Monday', 'please'], tags: ['O', 'O', 'O', 'B-day', 'O'] });
  });

  it('unlabelled means no done or draft layer of anyone but the model', async () => {
    const db = dbTest();
    const { projectId, ids } = await bare(db);
    const [a, b, c, d] = ids as [number, number, number, number];
    await layerSave(db, [a, 'ann-a'], { status: 'done' }, { expectedRevision: 0, who: 'ann-a' });
    await layerSave(db, [b, 'ann-b'], { status: 'draft' }, { expectedRevision: 0, who: 'ann-b' });
    await layerSave(db, [c, 'ann-a'], { status: 'skipped' }, { expectedRevision: 0, who: 'ann-a' });
    await layerSave(db, [d, 'model'], { status: 'draft' }, { expectedRevision: 0, who: 'model' });
    const left = await modelUnlabelled(db, projectId);
    expect(left.map((u) => u.id)).toEqual([c, d]);
    expect(left[0]?.words).toEqual(['how', 'much', 'to', 'fix', 'a', 'leaking', 'tap', '🔧']);
  });

  it('least confidence round-trips through the note as decimal text', () => {
    for (const v of [0, 1, 0.5, 0.123456, 0.9999994]) expect(leastConfidenceFromNote(leastConfidenceNote(v))).toBeCloseTo(v, 6);
    expect(leastConfidenceFromNote('')).toBeNull();
    expect(leastConfidenceFromNote('checked by hand')).toBeNull();
  });

  it('writes suggestions as draft model layers in the project scheme, rewrites them on a second run, and queues most uncertain first', async () => {
    const db = dbTest();
    const { projectId, ids } = await bare(db, 'bioes');
    const [a, b, c] = ids as [number, number, number];
    const first = [
      { utteranceId: a, tags: ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window'], leastConfidence: 0.2 },
      { utteranceId: b, tags: ['O', 'O', 'O', 'B-day', 'O'], leastConfidence: 0.7 },
      { utteranceId: c, tags: ['O', 'O', 'O', 'O', 'O', 'B-problem', 'I-problem', 'O'], leastConfidence: 0.7 },
    ];
    expect(await modelLayersWrite(db, 'bioes', first, 'lead')).toBe(3);
    const layer = await db.layers.get([c, 'model']);
    expect(layer).toMatchObject({ status: 'draft', note: '0.7', tags: ['O', 'O', 'O', 'O', 'O', 'B-problem', 'E-problem', 'O'] });
    expect((await layerHistory(db, [c, 'model']))[0]?.who).toBe('lead');
    const queue = await modelQueue(db, projectId, 2);
    expect(queue.total).toBe(3);
    // Ties keep project order.
    expect(queue.top.map((e) => e.utteranceId)).toEqual([b, c]);
    expect(queue.top[0]).toMatchObject({ seq: 2, text: 'move it to Monday please', leastConfidence: 0.7 });
    await modelLayersWrite(db, 'bioes', [{ utteranceId: a, tags: ['O', 'O', 'O', 'O', 'O', 'O'], leastConfidence: 0.9 }]);
    expect((await db.layers.get([a, 'model']))?.revision).toBe(2);
    expect((await modelQueue(db, projectId, 1)).top[0]?.utteranceId).toBe(a);
    // The model layer is no annotator row (reserved name).
    expect(await db.annotators.where('[projectId+id]').equals([projectId, 'model']).count()).toBe(0);
  });

  it('a training set trains in the worker runner and the stored model file reads back', async () => {
    const db = dbTest();
    const { projectId, ids } = await bare(db);
    for (const [i, id] of ids.entries()) await layerSave(db, [id, 'ann-a'], { tags: tagsOf(i), status: 'done' }, { expectedRevision: 0, who: 'ann-a' });
    const set = await modelTrainingSet(db, projectId);
    const runner = crfRunnerCreate(() => Promise.resolve());
    const outcome = await runner.train({ sequences: set.sequences, maxIterations: 5, folds: 2 }, () => {});
    expect(outcome.crossValidation?.pooled.utterances).toBe(4);
    await projectModelSave(db, projectId, { json: outcome.modelJson, origin: 'trained', crossValidation: outcome.crossValidation });
    const stored = await projectModel(db, projectId);
    expect(crfModelFromJson(stored?.json ?? '').training.utterances).toBe(4);
    expect(stored?.crossValidation).toEqual(outcome.crossValidation);
  });
});
