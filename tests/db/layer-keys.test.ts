import Dexie from 'dexie';
import { describe, expect, it } from 'vitest';
import { LAYER_STATUSES } from '../../src/core/backup/model';
import { batchAppend, batchBegin } from '../../src/db/batch-repo';
import { layerKeysDistinct } from '../../src/db/layer-keys';
import { layerSave } from '../../src/db/layer-repo';
import { projectCreate } from '../../src/db/project-repo';
import { dbTest, SAMPLE } from './helpers';

describe('layerKeysDistinct', () => {
  it('gives exactly the distinct index keys that uniqueKeys gives, per project', async () => {
    const db = dbTest();
    const projects: number[] = [];
    for (const name of ['Repairs', 'Gutters', 'Empty']) projects.push((await projectCreate(db, { name })).id);
    // Layers of several owners and statuses in the first two projects, with runs of equal keys.
    for (const [p, projectId] of projects.slice(0, 2).entries()) {
      const batchId = await batchBegin(db, projectId, { fileName: 'a.iob', format: 'columns', annotator: p === 0 ? 'ana' : 'ben' });
      const ids = (await batchAppend(db, batchId, { utterances: SAMPLE })).utteranceIds;
      for (const [i, id] of ids.entries()) {
        const status = LAYER_STATUSES[(i + p) % LAYER_STATUSES.length] ?? 'done';
        await layerSave(db, [id, 'gold'], { status }, { expectedRevision: 0, who: 'rosa' });
        if (i % 2 === 0) await layerSave(db, [id, 'cleo'], { status: 'done' }, { expectedRevision: 0, who: 'cleo' });
      }
    }
    for (const projectId of projects) {
      const reference = await db.layers
        .where('[projectId+annotator+status]')
        .between([projectId, Dexie.minKey, Dexie.minKey], [projectId, Dexie.maxKey, Dexie.maxKey])
        .uniqueKeys();
      expect(await layerKeysDistinct(db, projectId)).toEqual(reference);
    }
    expect((await layerKeysDistinct(db, projects[0] as number)).length).toBeGreaterThan(3);
    expect(await layerKeysDistinct(db, projects[2] as number)).toEqual([]);
  });
});
