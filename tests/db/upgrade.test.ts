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
 * Today the current version is 1, so the v1 case checks that v1 data loads as written.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import { backupMake } from '../../src/db/backup-repo';
import { layerGet, layerHistory, layerSave } from '../../src/db/layer-repo';
import { projectList } from '../../src/db/project-repo';
import { annotatorList } from '../../src/db/annotator-repo';
import { SCHEMA_VERSION_CURRENT, type SlotsmithDb } from '../../src/db/schema';
import { tokensUnpack } from '../../src/db/tokens';
import { projectCounts, utterancePage } from '../../src/db/utterance-repo';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import { dbLoad, type Dump } from './dump';
import { dbTest } from './helpers';

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
});
