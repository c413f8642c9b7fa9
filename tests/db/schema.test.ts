import { IDBDatabase, IDBFactory } from 'fake-indexeddb';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import { SCHEMA_VERSION_CURRENT, SCHEMA_VERSIONS } from '../../src/db/schema';
import { tokensCount, tokensPack, tokensProblem, tokensUnpack } from '../../src/db/tokens';
import { dbTest, SAMPLE } from './helpers';

afterEach(() => {
  vi.restoreAllMocks();
});

describe('schema', () => {
  it('opens at the newest version with every table', async () => {
    const db = dbTest();
    await db.open();
    expect(db.verno).toBe(SCHEMA_VERSION_CURRENT);
    expect(db.tables.map((t) => t.name).sort()).toEqual(['annotators', 'batches', 'history', 'layers', 'projects', 'utterances']);
    expect(SCHEMA_VERSIONS.map((v) => v.version)).toEqual(SCHEMA_VERSIONS.map((_, i) => i + 1));
    db.close();
  });

  it('stores tokens as an Int32Array and reads them back as core tokens', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, project.id, { fileName: 'a.iob', format: 'columns' });
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE });
    const row = await db.utterances.get(utteranceIds[2] as number);
    expect(row?.tokens).toBeInstanceOf(Int32Array);
    expect(tokensUnpack(row?.tokens ?? [])).toEqual(SAMPLE[2]?.tokens);
    expect(tokensCount(row?.tokens ?? [])).toBe(SAMPLE[2]?.tokens.length);
  });

  it('packs and checks token offsets', () => {
    const tokens = [{ start: 0, end: 4 }, { start: 5, end: 9 }];
    expect(Array.from(tokensPack(tokens))).toEqual([0, 4, 5, 9]);
    expect(tokensUnpack(tokensPack(tokens))).toEqual(tokens);
    expect(tokensProblem(tokens, 9)).toBeNull();
    expect(tokensProblem(tokens, 8)).toMatch(/token 2/);
    expect(tokensProblem([{ start: 2, end: 2 }], 5)).toMatch(/token 1/);
    expect(tokensProblem([{ start: 3, end: 5 }, { start: 4, end: 6 }], 9)).toMatch(/token 2/);
  });

  // IndexedDB 3.0 IDBTransactionOptions.durability; Dexie 4 passes its chromeTransactionDurability option there.
  it('asks IndexedDB for strict durability on label edits (and every other write)', async () => {
    const spy = vi.spyOn(IDBDatabase.prototype, 'transaction');
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Repairs' });
    const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 1) });
    spy.mockClear();
    await layerSave(db, [utteranceIds[0] as number, 'ana'], { status: 'done' }, { expectedRevision: 0, who: 'ana' });
    const writes = spy.mock.calls.filter(([, mode]) => mode === 'readwrite');
    expect(writes.length).toBeGreaterThan(0);
    for (const [, , options] of writes) expect(options).toEqual({ durability: 'strict' });
    // What the IDB transaction object itself reports (IDBTransaction.durability).
    const tx = spy.mock.results.find((r) => r.type === 'return')?.value as { durability?: string } | undefined;
    expect(tx?.durability).toBe('strict');
  });

  it('lets a benchmark choose relaxed durability', async () => {
    const spy = vi.spyOn(IDBDatabase.prototype, 'transaction');
    const db = dbTest({ durability: 'relaxed' });
    await projectCreate(db, { name: 'Bench' });
    const writes = spy.mock.calls.filter(([, mode]) => mode === 'readwrite');
    expect(writes.map(([, , o]) => o)).toContainEqual({ durability: 'relaxed' });
  });

  it('uses the injected factory (node has no global indexedDB)', async () => {
    const factory = new IDBFactory();
    const db = dbTest({ factory, name: 'injected' });
    await db.open();
    expect((await factory.databases()).map((d) => d.name)).toEqual(['injected']);
    db.close();
  });
});
