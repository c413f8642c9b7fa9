import { describe, expect, it } from 'vitest';
import { batchAppend, batchBegin, batchFinish, batchRollback } from '../../src/db/batch-repo';
import { corpusIndexSignature, corpusSignatureSame } from '../../src/db/corpus-index';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate, projectRename } from '../../src/db/project-repo';
import { dbTest, SAMPLE } from './helpers';

describe('corpusIndexSignature', () => {
  it('changes with every kind of write to a project’s utterances and layers, and only then', async () => {
    const db = dbTest();
    const { id: projectId } = await projectCreate(db, { name: 'Repairs' });
    const other = (await projectCreate(db, { name: 'Other' })).id;
    const seen = [await corpusIndexSignature(db, projectId)];
    const expectChanged = async () => {
      const next = await corpusIndexSignature(db, projectId);
      for (const earlier of seen) expect(corpusSignatureSame(earlier, next)).toBe(false);
      seen.push(next);
    };
    const expectSame = async () => expect(corpusSignatureSame(seen.at(-1)!, await corpusIndexSignature(db, projectId))).toBe(true);

    await expectSame();
    // An import chunk before the import is finished, then its finish.
    const batchId = await batchBegin(db, projectId, { fileName: 'a.iob', format: 'columns', annotator: 'ana' });
    await expectChanged();
    const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE.slice(0, 2) });
    await expectChanged();
    await batchFinish(db, batchId, { utterances: 2 });
    await expectChanged();
    // A label edit.
    await layerSave(db, [utteranceIds[0] as number, 'ben'], { tags: ['O', 'O', 'B-service', 'O', 'B-day', 'O'] }, { expectedRevision: 0, who: 'ben' });
    await expectChanged();
    // An interrupted import rolled back: its chunk's rows go, the batch says so.
    const broken = await batchBegin(db, projectId, { fileName: 'b.iob', format: 'columns', annotator: 'ana' });
    await batchAppend(db, broken, { utterances: SAMPLE.slice(2, 3) });
    await expectChanged();
    await batchRollback(db, broken, { state: 'failed', failure: 'interrupted', onlyIfImporting: true });
    await expectChanged();
    // The project row itself (its name is not part of what the index shows, its updated time is).
    await projectRename(db, projectId, 'Repairs north');
    await expectChanged();
    // Writes to another project change nothing here.
    await batchAppend(db, await batchBegin(db, other, { fileName: 'c.iob', format: 'columns', annotator: 'ana' }), { utterances: SAMPLE.slice(0, 1) });
    await expectSame();
  });
});
