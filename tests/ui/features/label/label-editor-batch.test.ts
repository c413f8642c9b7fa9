import { describe, expect, it } from 'vitest';
import { spansFromTags } from '../../../../src/core/schemes';
import { batchAppend, batchBegin } from '../../../../src/db/batch-repo';
import { layerGet, layerHistory, layerSave } from '../../../../src/db/layer-repo';
import { projectCreate } from '../../../../src/db/project-repo';
import type { LayerKey } from '../../../../src/db/schema';
import { LabelEditor } from '../../../../src/ui/features/label/label-editor';
import { suggestionAcceptOp, suggestionsFor } from '../../../../src/ui/features/label/suggestions';
import { dbTest, utteranceMake } from '../../../db/helpers';

const spans = (tags: readonly string[] | undefined) => spansFromTags(tags ?? []).map((s) => `${s.slot}:${s.start}-${s.end}`);

async function withModel() {
  const db = dbTest();
  const project = await projectCreate(db, { name: 'Repairs' });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
  const { utteranceIds } = await batchAppend(db, batchId, { utterances: [utteranceMake('send an electrician to riverside on monday')] });
  const id = utteranceIds[0] as number;
  // 0 send, 1 an, 2 electrician, 3 to, 4 riverside, 5 on, 6 monday
  const modelTags = ['O', 'O', 'B-service', 'O', 'B-area', 'O', 'B-day'];
  await layerSave(db, [id, 'model'], { tags: modelTags, status: 'draft', note: '0.41' }, { expectedRevision: 0, who: 'model' });
  const key: LayerKey = [id, 'ann-c'];
  const editor = new LabelEditor(db, 'ann-c');
  editor.open(key, await layerGet(db, key), 7);
  return { db, key, id, editor, modelTags };
}

describe('LabelEditor.editAll (accepting suggestions)', () => {
  it('accepting every suggestion is one save, one history row and one undo step; the model layer is untouched', async () => {
    const { db, key, id, editor, modelTags } = await withModel();
    const own = editor.snapshot().edit?.tags ?? [];
    expect(own.every((t) => t === 'O')).toBe(true);
    expect(editor.snapshot().edit?.status).toBe('unlabelled');
    editor.editAll(suggestionsFor(modelTags, own, new Set()).map(suggestionAcceptOp));
    expect(spans(editor.snapshot().edit?.tags)).toEqual(['service:2-3', 'area:4-5', 'day:6-7']);
    await editor.idle();
    const row = await layerGet(db, key);
    expect(row).toMatchObject({ revision: 1, status: 'draft', tags: modelTags });
    expect(await layerHistory(db, key)).toHaveLength(1);
    expect(await layerGet(db, [id, 'model'])).toMatchObject({ revision: 1, status: 'draft', note: '0.41' });

    editor.undo();
    await editor.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 2, status: 'unlabelled', tags: ['O', 'O', 'O', 'O', 'O', 'O', 'O'] });
    editor.redo();
    await editor.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 3, status: 'draft', tags: modelTags });
  });

  it('accepting one keeps the rest on offer; none is no edit at all', async () => {
    const { db, key, editor, modelTags } = await withModel();
    editor.editAll([]);
    await editor.idle();
    expect(await layerGet(db, key)).toBeUndefined();
    const [first] = suggestionsFor(modelTags, editor.snapshot().edit?.tags ?? [], new Set());
    editor.editAll([suggestionAcceptOp(first as NonNullable<typeof first>)]);
    await editor.idle();
    const row = await layerGet(db, key);
    expect(spans(row?.tags)).toEqual(['service:2-3']);
    expect(suggestionsFor(modelTags, row?.tags ?? [], new Set()).map((s) => s.slot)).toEqual(['area', 'day']);
  });

  it('after a conflict, "apply mine on top" replays every accepted span on the other version', async () => {
    const { db, key, editor, modelTags } = await withModel();
    const other = new LabelEditor(db, 'ann-c');
    other.open(key, undefined, 7);
    other.edit({ kind: 'intent', intent: 'book_visit' });
    await other.idle();
    editor.editAll(suggestionsFor(modelTags, editor.snapshot().edit?.tags ?? [], new Set()).map(suggestionAcceptOp));
    await editor.idle();
    expect(editor.snapshot().conflict).not.toBeNull();
    editor.conflictApplyMine();
    await editor.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 2, intent: 'book_visit', tags: modelTags });
  });
});
