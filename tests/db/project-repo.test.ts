import { describe, expect, it } from 'vitest';
import { annotatorEnsure, annotatorList } from '../../src/db/annotator-repo';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { InvalidInputError, RecordMissingError } from '../../src/db/errors';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectDelete, projectGet, projectList, projectRename, projectSchemaSet } from '../../src/db/project-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { CLOCK_START, dbTest, SAMPLE } from './helpers';
import { dbDump } from './dump';

/** A project with one finished import into ana's layers, one edit by bo and one by gold. */
async function projectFilled(db: SlotsmithDb, name: string): Promise<number> {
  const project = await projectCreate(db, { name });
  const batchId = await batchBegin(db, project.id, { fileName: `${name}.iob`, format: 'columns', annotator: 'ana' });
  const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE });
  await batchFinish(db, batchId, { utterances: SAMPLE.length });
  const first = utteranceIds[0] as number;
  await layerSave(db, [first, 'bo'], { status: 'draft' }, { expectedRevision: 0, who: 'bo' });
  await layerSave(db, [first, 'gold'], { status: 'done', intent: 'book_visit' }, { expectedRevision: 0, who: 'cy' });
  return project.id;
}

describe('projects', () => {
  it('creates with defaults, renames, sets the schema and lists', async () => {
    const db = dbTest();
    const a = await projectCreate(db, { name: '  Boiler visits  ' });
    expect(a).toMatchObject({ name: 'Boiler visits', created: CLOCK_START, updated: CLOCK_START, tokeniser: { kind: 'words' }, scheme: 'iob2', schema: { slots: [], intents: [] } });
    const b = await projectCreate(db, { name: 'Taps', scheme: 'bioes', tokeniser: { kind: 'whitespace' } });
    const renamed = await projectRename(db, a.id, 'Boilers');
    expect(renamed.name).toBe('Boilers');
    expect(renamed.updated).toBeGreaterThan(a.updated);
    const schema = { slots: [{ name: 'service', key: 's', colour: '#2a6f97', examples: ['plumber'] }], intents: [{ name: 'book_visit' }] };
    await projectSchemaSet(db, b.id, schema);
    expect((await projectGet(db, b.id))?.schema).toEqual(schema);
    expect((await projectList(db)).map((p) => p.name)).toEqual(['Boilers', 'Taps']);
  });

  it('refuses empty names and unknown projects', async () => {
    const db = dbTest();
    await expect(projectCreate(db, { name: '   ' })).rejects.toBeInstanceOf(InvalidInputError);
    await expect(projectRename(db, 99, 'x')).rejects.toBeInstanceOf(RecordMissingError);
    await expect(projectDelete(db, 99)).rejects.toBeInstanceOf(RecordMissingError);
  });

  it('deletes a project with all its rows and leaves other projects untouched', async () => {
    const db = dbTest();
    const doomed = await projectFilled(db, 'doomed');
    const kept = await projectFilled(db, 'kept');
    const before = await dbDump(db);
    const report = await projectDelete(db, doomed);
    expect(report).toEqual({ utterances: SAMPLE.length, layers: SAMPLE.length + 2, annotators: 2, batches: 1, history: 2 });
    const after = await dbDump(db);
    for (const [table, rows] of Object.entries(after)) {
      const keptRows = (before[table] ?? []).filter((r) => ((r as { projectId?: number; id?: number }).projectId ?? (r as { id: number }).id) === kept);
      expect(rows, table).toEqual(keptRows);
    }
    expect(await projectGet(db, doomed)).toBeUndefined();
  });
});

describe('annotators', () => {
  it('ensures once, keeps the first name, refuses reserved and malformed ids', async () => {
    const db = dbTest();
    const { id } = await projectCreate(db, { name: 'Repairs' });
    expect(await annotatorEnsure(db, id, 'ana', { name: 'Ana P.', role: 'adjudicator' })).toEqual({ projectId: id, id: 'ana', name: 'Ana P.', role: 'adjudicator' });
    expect(await annotatorEnsure(db, id, 'ana', { name: 'Other' })).toMatchObject({ name: 'Ana P.' });
    await annotatorEnsure(db, id, 'bo');
    expect((await annotatorList(db, id)).map((a) => [a.id, a.name, a.role])).toEqual([
      ['ana', 'Ana P.', 'adjudicator'],
      ['bo', 'bo', 'annotator'],
    ]);
    await expect(annotatorEnsure(db, id, 'gold')).rejects.toBeInstanceOf(InvalidInputError);
    await expect(annotatorEnsure(db, id, 'model')).rejects.toBeInstanceOf(InvalidInputError);
    await expect(annotatorEnsure(db, id, ' ana')).rejects.toBeInstanceOf(InvalidInputError);
    await expect(annotatorEnsure(db, id, 'a\tb')).rejects.toBeInstanceOf(InvalidInputError);
    await expect(annotatorEnsure(db, 99, 'cy')).rejects.toBeInstanceOf(RecordMissingError);
  });
});
