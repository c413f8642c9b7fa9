import fc from 'fast-check';
import { afterEach, describe, expect, it } from 'vitest';
import { backupEncode, type BackupData } from '../../src/core/backup';
import { backupMake, backupRestore } from '../../src/db/backup-repo';
import { batchAppend, batchBegin, batchFinish, batchRollback } from '../../src/db/batch-repo';
import { BatchStateError, StorageFullError } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectDelete } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { backupDataArbitrary, TAG_POOL } from '../core/backup/arbitraries';
import { utteranceArbitrary } from '../generators/formats';
import { dbDump } from './dump';
import { CLOCK_START, dbTest, SAMPLE } from './helpers';
import { quotaFake, type QuotaFake } from './quota-fake';

const CREATED = new Date(CLOCK_START).toISOString();
const dbFixedClock = () => dbTest({ clock: () => CLOCK_START });
const text = (parts: string[]) => parts.join('');
const byCodeUnits = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** The order backupMake writes: annotators by id, layers by annotator then seq (see backup-repo.ts). */
function canonical(data: BackupData): BackupData {
  return {
    ...data,
    annotators: [...data.annotators].sort((a, b) => byCodeUnits(a.id, b.id)),
    layers: [...data.layers].sort((a, b) => byCodeUnits(a.annotator, b.annotator) || a.seq - b.seq),
  };
}

let quota: QuotaFake | undefined;
afterEach(() => quota?.restore());

async function restoredOk(db: SlotsmithDb, backup: string): Promise<number> {
  const result = await backupRestore(db, backup);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  expect(result.warnings).toEqual([]);
  return result.projectId;
}

describe('backup and restore', () => {
  it('restores any valid backup into a new project that backs up to the same bytes', async () => {
    await fc.assert(
      fc.asyncProperty(backupDataArbitrary, async (data) => {
        const db = dbFixedClock();
        const other = await projectCreate(db, { name: 'already here' });
        const backup = backupEncode(canonical(data), CREATED);
        const projectId = await restoredOk(db, backup);
        expect(projectId).not.toBe(other.id);
        expect(text((await backupMake(db, projectId)).parts)).toBe(backup);
        db.close();
      }),
      { seed: 42, numRuns: 40 },
    );
  });

  it('backs up a project built by imports and edits, and its restore is identical', async () => {
    const illegal = fc.array(fc.constantFrom(...TAG_POOL), { minLength: 12, maxLength: 12 });
    const project = fc.array(fc.tuple(utteranceArbitrary('iob2'), fc.boolean(), illegal), { minLength: 1, maxLength: 6 });
    await fc.assert(
      fc.asyncProperty(project, fc.array(fc.nat(), { maxLength: 5 }), async (rows, edits) => {
        const db = dbFixedClock();
        const { id } = await projectCreate(db, { name: 'עבודות 🔧', scheme: 'iob2', schema: { slots: [{ name: 'day', key: 'd' }], intents: [{ name: 'book_visit' }] } });
        // Some utterances keep their legal tags, others get tags from the illegal pool, as an import would keep them.
        const utterances = rows.map(([u, keep, tags]) => (keep ? u : { ...u, tags: tags.slice(0, u.tokens.length) }));
        const batchId = await batchBegin(db, id, { fileName: 'jobs.iob', format: 'columns', annotator: 'ana' });
        const { utteranceIds } = await batchAppend(db, batchId, { utterances });
        await batchFinish(db, batchId, { utterances: utterances.length });
        const cancelled = await batchBegin(db, id, { fileName: 'half.txt', format: 'text' });
        await batchAppend(db, cancelled, { utterances: SAMPLE.slice(0, 1) });
        await batchRollback(db, cancelled);
        for (const [i, pick] of edits.entries()) {
          const uid = utteranceIds[pick % utteranceIds.length] as number;
          const owner = i % 2 === 0 ? 'ana' : 'gold';
          const stored = await db.layers.get([uid, owner]);
          await layerSave(db, [uid, owner], { status: 'flagged', note: `edit ${i}` }, { expectedRevision: stored?.revision ?? 0, who: 'cy' });
        }
        const first = text((await backupMake(db, id)).parts);
        const copy = await restoredOk(db, first);
        expect(text((await backupMake(db, copy)).parts)).toBe(first);
        // Deleting the original leaves the copy whole.
        await projectDelete(db, id);
        expect(text((await backupMake(db, copy)).parts)).toBe(first);
        db.close();
      }),
      { seed: 42, numRuns: 25 },
    );
  });

  it("keeps a batch's attached count: a second annotator's file that only added layers restores as it was", async () => {
    const db = dbFixedClock();
    const { id } = await projectCreate(db, { name: 'Repairs' });
    const first = await batchBegin(db, id, { fileName: 'ana.iob', format: 'columns', annotator: 'ana' });
    const withIds = SAMPLE.filter((u) => u.id !== undefined);
    await batchAppend(db, first, { utterances: withIds });
    await batchFinish(db, first, { utterances: withIds.length });
    const second = await batchBegin(db, id, { fileName: 'ben.iob', format: 'columns', annotator: 'ben' });
    await batchAppend(db, second, { utterances: withIds.slice(0, 2), attach: 'external-id' });
    await batchFinish(db, second, { utterances: 2 });
    const backup = text((await backupMake(db, id)).parts);
    const batchLines = backup.split('\n').filter((l) => l.startsWith('{"type":"batch"'));
    expect(batchLines.map((l) => (JSON.parse(l) as { attached?: number }).attached)).toEqual([undefined, 2]);
    const copy = await restoredOk(db, backup);
    const restored = await db.batches.where('projectId').equals(copy).sortBy('id');
    expect(restored.map((b) => [b.fileName, b.counts.utterances, b.attached])).toEqual([
      ['ana.iob', withIds.length, undefined],
      ['ben.iob', 0, 2],
    ]);
    expect(text((await backupMake(db, copy)).parts)).toBe(backup);
  });

  it('refuses invalid and newer backups with line-numbered errors, storing nothing', async () => {
    const source = await backupRestoreSource(dbFixedClock());
    const db = dbFixedClock();
    await projectCreate(db, { name: 'kept' });
    const before = await dbDump(db);
    const newer = '{"format":"slotsmith-backup","formatVersion":7,"created":"2031-01-01T00:00:00.000Z"}\n';
    expect(await backupRestore(db, newer)).toEqual({ ok: false, errors: [{ line: 1, message: 'made by a newer Slotsmith (format 7); this version reads up to 2' }] });
    const broken = source.replace('"seq":2', '"seq":"two"');
    const result = await backupRestore(db, broken);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.errors[0]?.message).toMatch(/"seq" must be a whole number/);
    expect(await dbDump(db)).toEqual(before);
  });

  it('restores under another name and suggests a file name', async () => {
    const db = dbFixedClock();
    const source = await backupRestoreSource(db);
    const result = await backupRestore(db, source, { name: 'Copy of jobs' });
    expect(result.ok && (await db.projects.get(result.projectId))?.name).toBe('Copy of jobs');
    expect((await backupMake(db, 1)).fileName).toBe('Jobs_ north-2025-03-14.slotsmith-backup.jsonl');
  });

  it('will not back up a project while an import into it is running', async () => {
    const db = dbFixedClock();
    const { id } = await projectCreate(db, { name: 'busy' });
    await batchBegin(db, id, { fileName: 'a.txt', format: 'text' });
    await expect(backupMake(db, id)).rejects.toBeInstanceOf(BatchStateError);
  });

  it('restores all or nothing when the disk fills part-way', async () => {
    const db = dbFixedClock();
    const source = await backupRestoreSource(db);
    const before = await dbDump(db);
    quota = await quotaFake();
    quota.failAfter(6);
    await expect(backupRestore(db, source)).rejects.toBeInstanceOf(StorageFullError);
    quota.failAfter(Infinity);
    expect(await dbDump(db)).toEqual(before);
  });
});

/** Backup text of a small project (created as project 1 of `db`). */
async function backupRestoreSource(db: SlotsmithDb): Promise<string> {
  const { id } = await projectCreate(db, { name: 'Jobs: north' });
  const batchId = await batchBegin(db, id, { fileName: 'north.iob', format: 'columns', annotator: 'ana' });
  const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE });
  await batchFinish(db, batchId, { utterances: SAMPLE.length });
  await layerSave(db, [utteranceIds[1] as number, 'gold'], { tags: ['O', 'O', 'O', 'B-day', 'O'], status: 'done' }, { expectedRevision: 0, who: 'cy' });
  return text((await backupMake(db, id)).parts);
}
