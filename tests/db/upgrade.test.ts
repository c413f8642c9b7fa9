/**
 * Upgrade tests from frozen fixtures. Every schema version N has tests/fixtures/db/v<N>-sample.json:
 * a dump (tests/db/dump.ts) of a database written by the code of version N, committed and never
 * regenerated. Each case creates a database at version N, loads the fixture, closes it, opens it
 * with the current schema (so every upgrade since N runs) and checks the data through the
 * repositories.
 *
 * When you bump the schema to N+1:
 *   1. append version N+1 (stores + upgrade) to SCHEMA_VERSIONS in src/db/schema.ts; never edit older ones;
 *   2. write v<N+1>-sample.json from a database made by the new code, and commit it frozen;
 *   3. add a case below for it, and keep every older case passing: they prove old data still opens.
 * Version 2 added the [projectId+externalId] index (attach on import); the v1 cases check that v1
 * data loads as written and that the new index covers the old rows.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { backupMake } from '../../src/db/backup-repo';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { layerGet, layerHistory, layerSave } from '../../src/db/layer-repo';
import { projectList } from '../../src/db/project-repo';
import { annotatorList } from '../../src/db/annotator-repo';
import { SCHEMA_VERSION_CURRENT, type SlotsmithDb } from '../../src/db/schema';
import { tokensUnpack } from '../../src/db/tokens';
import { projectCounts, utterancePage } from '../../src/db/utterance-repo';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import { dbLoad, type Dump } from './dump';
import { dbTest, utteranceMake } from './helpers';

const FIXTURES = new URL('../fixtures/db/', import.meta.url);

function fixtureRead(version: number): { schemaVersion: number; tables: Dump } {
  return JSON.parse(readFileSync(new URL(`v${version}-sample.json`, FIXTURES), 'utf8')) as { schemaVersion: number; tables: Dump };
}

/** A database written at `version` from its fixture, then reopened with the current schema. */
async function dbUpgradedFrom(version: number): Promise<SlotsmithDb> {
  const fixture = fixtureRead(version);
  expect(fixture.schemaVersion).toBe(version);
  const factory = new IDBFactory();
  const old = dbTest({ factory, name: 'slotsmith', versionMax: version });
  await old.open();
  expect(old.verno).toBe(version);
  await dbLoad(old, fixture.tables);
  old.close();
  const db = dbTest({ factory, name: 'slotsmith' });
  await db.open();
  expect(db.verno).toBe(SCHEMA_VERSION_CURRENT);
  return db;
}

describe('schema upgrades', () => {
  it('has a frozen fixture for every schema version', () => {
    const versions = readdirSync(FIXTURES)
      .map((name) => /^v(\d+)-sample\.json$/.exec(name)?.[1])
      .filter((v): v is string => v !== undefined)
      .map(Number)
      .sort((a, b) => a - b);
    expect(versions).toEqual(Array.from({ length: SCHEMA_VERSION_CURRENT }, (_, i) => i + 1));
  });

  it('opens version 1 data with the current schema', async () => {
    const db = await dbUpgradedFrom(1);
    const [project] = await projectList(db);
    expect(project).toMatchObject({ id: 1, name: 'Home repairs — north', scheme: 'iob2', tokeniser: { kind: 'whitespace' } });
    expect(project?.schema.slots.map((s) => s.name)).toEqual(['service', 'day', 'problem', 'time_window', 'contact_phone']);
    expect((await annotatorList(db, 1)).map((a) => [a.id, a.role])).toEqual([
      ['ana', 'annotator'],
      ['cy', 'adjudicator'],
    ]);

    const utterances = await utterancePage(db, 1, null, 10);
    expect(utterances.map((u) => u.seq)).toEqual([1, 2, 3, 4, 5]);
    expect(utterances[3]?.text).toBe('תקנו את הברז מחר call 555-0142');
    for (const u of utterances) expect(tokensUnpack(u.tokens)).toEqual(tokeniseWhitespace(u.text));
    expect(utterances[4]).toMatchObject({ intentHint: 'ask_price', source: { batchId: 3 } });

    const id = (seq: number) => utterances[seq - 1]?.id as number;
    expect((await layerGet(db, [id(2), 'ana']))?.tags).toEqual(['O', 'O', 'O', 'B-day', 'O']);
    expect((await layerGet(db, [id(1), 'gold']))?.intent).toBe('book_visit');
    const history = await layerHistory(db, [id(2), 'ana']);
    // The imported illegal sequence survives in the history.
    expect(history[0]?.before?.tags).toEqual(['O', 'O', 'O', 'I-day', 'O']);
    expect(await db.batches.toArray()).toEqual([
      expect.objectContaining({ id: 1, state: 'done', warnings: [{ line: 30, message: 'line has one column; expected token and tag' }] }),
      expect.objectContaining({ id: 2, state: 'cancelled' }),
      expect.objectContaining({ id: 3, state: 'done' }),
    ]);
    expect(await projectCounts(db, 1)).toEqual({
      utterances: 5,
      layers: {
        ana: { unlabelled: 0, draft: 0, done: 4, skipped: 0, flagged: 0 },
        gold: { unlabelled: 0, draft: 0, done: 1, skipped: 0, flagged: 0 },
      },
    });

    // The upgraded database takes writes and backs up.
    const saved = await layerSave(db, [id(4), 'ana'], { status: 'flagged' }, { expectedRevision: 1, who: 'ana' });
    expect(saved.revision).toBe(2);
    expect((await backupMake(db, 1)).parts.length).toBe(1 + 1 + 2 + 3 + 5 + 5 + 3);
    db.close();
  });

  it('indexes version 1 utterances by external id after the upgrade to 2, so a new file attaches to them', async () => {
    const db = await dbUpgradedFrom(1);
    const byId = await db.utterances.where('[projectId+externalId]').equals([1, 'hr-002']).toArray();
    expect(byId.map((u) => [u.seq, u.text])).toEqual([[2, 'move it to Monday please']]);
    // The utterance without an id (seq 3 in the fixture) is simply absent from the index.
    expect(await db.utterances.where('[projectId+externalId]').between([1, ''], [1, '\uffff']).count()).toBe(
      (await db.utterances.toArray()).filter((u) => u.externalId !== undefined).length,
    );
    const batchId = await batchBegin(db, 1, { fileName: 'ben.iob2', format: 'columns', annotator: 'ben' });
    const result = await batchAppend(db, batchId, { utterances: [utteranceMake('move it to Monday please', ['O', 'O', 'O', 'B-day', 'O'], { id: 'hr-002' })], attach: 'external-id' });
    expect(result).toMatchObject({ attached: 1, utteranceIds: [byId[0]?.id] });
    await batchFinish(db, batchId, { utterances: 1 });
    expect((await projectCounts(db, 1)).utterances).toBe(5);
    expect((await layerGet(db, [byId[0]?.id as number, 'ben']))?.tags).toEqual(['O', 'O', 'O', 'B-day', 'O']);
    db.close();
  });

  it('opens version 2 data with the current schema: one utterance, two annotators’ layers', async () => {
    const db = await dbUpgradedFrom(2);
    const [project] = await projectList(db);
    expect(project).toMatchObject({ id: 1, name: 'Home repairs — south', scheme: 'iob2' });
    const utterances = await utterancePage(db, 1, null, 10);
    expect(utterances.map((u) => u.externalId)).toEqual(['hs-001', 'hs-002', 'hs-003', 'hs-004']);
    for (const u of utterances) expect(tokensUnpack(u.tokens)).toEqual(tokeniseWhitespace(u.text));
    const [first] = await db.utterances.where('[projectId+externalId]').equals([1, 'hs-001']).toArray();
    expect(first?.seq).toBe(1);
    expect((await layerGet(db, [first?.id as number, 'ann-a']))?.batchId).toBe(1);
    expect((await layerGet(db, [first?.id as number, 'ann-b']))).toMatchObject({ batchId: 2, revision: 2 });
    expect((await layerHistory(db, [first?.id as number, 'ann-b']))[0]?.before?.tags).toEqual(['O', 'O', 'B-service', 'O', 'B-area', 'I-area', 'B-day']);
    expect(await db.batches.toArray()).toEqual([
      expect.objectContaining({ id: 1, state: 'done', counts: { utterances: 3, tokens: 19, layers: 3 } }),
      expect.objectContaining({ id: 2, state: 'done', counts: { utterances: 1, tokens: 5, layers: 3 }, attached: 2 }),
      expect.objectContaining({ id: 3, state: 'cancelled', attached: 1 }),
    ]);
    expect(await projectCounts(db, 1)).toEqual({
      utterances: 4,
      layers: {
        'ann-a': { unlabelled: 0, draft: 0, done: 3, skipped: 0, flagged: 0 },
        'ann-b': { unlabelled: 0, draft: 0, done: 3, skipped: 0, flagged: 0 },
        gold: { unlabelled: 0, draft: 0, done: 1, skipped: 0, flagged: 0 },
      },
    });
    db.close();
  });
});
