import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { dismissalKeyUtterance } from '../../src/core/backup';
import { crfCrossValidate, crfModelFromJson, crfModelToJson, crfTrain } from '../../src/core/crf';
import { findingKey } from '../../src/core/error-detect';
import { backupMake, backupRestore } from '../../src/db/backup-repo';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { packProgress, packsMake, projectExchange } from '../../src/db/exchange-repo';
import { findingsDismiss, findingsDismissed } from '../../src/db/findings-repo';
import { modelTrainingSet, projectModel, projectModelSave } from '../../src/db/model-repo';
import { projectCreate, projectDelete } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { dbTest, SAMPLE } from './helpers';

const FIXTURE_FORMAT_1 = new URL('../fixtures/backup-format1.slotsmith-backup.jsonl', import.meta.url);
const text = (parts: string[]) => parts.join('');

async function idOfSeq(db: SlotsmithDb, projectId: number, seq: number): Promise<number> {
  return (await db.utterances.where('[projectId+seq]').equals([projectId, seq]).first())?.id ?? -1;
}

/** A model-disagreement key as the findings scan builds it: the utterance named by its database id (src/workers/findings-run.ts). */
function disagreementKey(utteranceId: number): string {
  return findingKey({ kind: 'model-disagreement', location: { id: String(utteranceId), layer: 'ann-x', start: 2, end: 3 }, tokens: ['plumber'], annotatorTags: ['B-service'], modelTags: ['O'], confidence: 0.93 });
}

const variationKey = findingKey({ kind: 'variation', tokens: ['friday', 'morning'], nucleus: { start: 1, end: 2 }, fringe: true, readings: [], occurrences: 2 });

/** The four sample utterances with done layers of ann-x, a trained model, two packs handed out and three dismissals. */
async function projectFull(db: SlotsmithDb): Promise<number> {
  const { id } = await projectCreate(db, { name: 'Boiler jobs' });
  const batchId = await batchBegin(db, id, { fileName: 'a.iob', format: 'columns', annotator: 'ann-x', layerStatus: 'done' });
  await batchAppend(db, batchId, { utterances: SAMPLE });
  await batchFinish(db, batchId, { utterances: SAMPLE.length });
  const { sequences } = await modelTrainingSet(db, id);
  const model = await crfTrain(sequences, { maxIterations: 15 });
  const crossValidation = await crfCrossValidate(sequences, { folds: 2, maxIterations: 5 });
  await projectModelSave(db, id, { json: crfModelToJson(model), origin: 'trained', crossValidation });
  await packsMake(db, id, new Map([['ana', [1, 2]], ['bo', [3, 4]]]), { names: { ana: 'Ana' } });
  // The last key names an utterance that is not in the project (deleted since): it can never match again.
  await findingsDismiss(db, id, [variationKey, disagreementKey(await idOfSeq(db, id, 2))], 'ana');
  await findingsDismiss(db, id, [disagreementKey(9999)], null);
  return id;
}

describe('backup and restore of the project row extras', () => {
  it('restores the saved model, the exchange and the dismissals, read back through their own stores, and backs up to the same bytes', async () => {
    const db = dbTest();
    const original = await projectFull(db);
    const made = await backupMake(db, original);
    expect(made.warnings).toEqual([]);
    const backup = text(made.parts);
    const projectLine = JSON.parse(backup.split('\n')[1] ?? '') as { dismissed: Record<string, unknown> };
    // In the file the disagreement names its utterance by seq (2), and the dangling one is gone.
    expect(Object.keys(projectLine.dismissed).map(dismissalKeyUtterance).sort()).toEqual(['2', null]);

    const model = await projectModel(db, original);
    const exchange = await projectExchange(db, original);
    const progress = await packProgress(db, original);
    const dismissed = await findingsDismissed(db, original);
    const originalKey = disagreementKey(await idOfSeq(db, original, 2));
    expect(Object.keys(dismissed)).toHaveLength(3);
    await projectDelete(db, original);

    const restored = await backupRestore(db, backup);
    if (!restored.ok) throw new Error(JSON.stringify(restored.errors));
    expect(restored.warnings).toEqual([]);
    const copy = restored.projectId;
    expect(await projectModel(db, copy)).toEqual(model);
    expect(crfModelFromJson((await projectModel(db, copy))?.json ?? '').labels).toEqual(crfModelFromJson(model?.json ?? '').labels);
    expect(await projectExchange(db, copy)).toEqual(exchange);
    expect(exchange?.packs.map((p) => p.annotator)).toEqual(['ana', 'bo']);
    expect(await packProgress(db, copy)).toEqual(progress);
    // The disagreement now names the restored utterance's own id; content keys are as they were.
    const renamed = disagreementKey(await idOfSeq(db, copy, 2));
    expect(renamed).not.toBe(originalKey);
    expect(await findingsDismissed(db, copy)).toEqual({ [variationKey]: dismissed[variationKey], [renamed]: dismissed[originalKey] });
    expect(dismissed[originalKey]).toMatchObject({ who: 'ana' });
    // Every line but the header (which holds the time of backing up) is the same.
    const again = text((await backupMake(db, copy)).parts).split('\n');
    expect(again.slice(1)).toEqual(backup.split('\n').slice(1));
    expect(JSON.parse(again[0] ?? '').counts).toEqual(JSON.parse(backup.split('\n')[0] ?? '').counts);
  });

  it('leaves a stored model no build can read out of the backup, and says so, so that the backup restores', async () => {
    const db = dbTest();
    const { id } = await projectCreate(db, { name: 'Boiler jobs' });
    await projectModelSave(db, id, { json: '{"x":1}', origin: 'file', crossValidation: null });
    const made = await backupMake(db, id);
    expect(made.warnings).toEqual(['The saved model is not a usable model file (not a slotsmith-crf-model file); it was left out of the backup.']);
    expect(made.parts[1]).not.toContain('"model"');
    const restored = await backupRestore(db, text(made.parts));
    expect(restored.ok && (await projectModel(db, restored.projectId))).toBeNull();
  });

  it('restores a format-1 backup (written before these fields): no model, exchange or dismissals, and the same records back', async () => {
    const db = dbTest();
    const fixture = readFileSync(FIXTURE_FORMAT_1, 'utf8');
    const restored = await backupRestore(db, fixture);
    if (!restored.ok) throw new Error(JSON.stringify(restored.errors));
    expect(restored.warnings).toEqual([]);
    expect(await projectModel(db, restored.projectId)).toBeNull();
    expect(await projectExchange(db, restored.projectId)).toBeNull();
    expect(await findingsDismissed(db, restored.projectId)).toEqual({});
    const again = text((await backupMake(db, restored.projectId)).parts).split('\n');
    expect(JSON.parse(again[0] ?? '')).toMatchObject({ formatVersion: 2 });
    expect(again.slice(1)).toEqual(fixture.split('\n').slice(1));
  });
});
