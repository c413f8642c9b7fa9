import { describe, expect, it } from 'vitest';
import { spansFromTags } from '../../../../src/core/schemes';
import { batchAppend, batchBegin } from '../../../../src/db/batch-repo';
import { layerGet, layerHistory, layerSave } from '../../../../src/db/layer-repo';
import { projectCreate } from '../../../../src/db/project-repo';
import type { LayerKey, SlotsmithDb } from '../../../../src/db/schema';
import { LabelEditor } from '../../../../src/ui/features/label/label-editor';
import { dbTest, SAMPLE } from '../../../db/helpers';

async function seeded(): Promise<{ db: SlotsmithDb; projectId: number; ids: number[] }> {
  const db = dbTest();
  const project = await projectCreate(db, { name: 'Repairs' });
  const batchId = await batchBegin(db, project.id, { fileName: 'a.txt', format: 'text' });
  const { utteranceIds } = await batchAppend(db, batchId, { utterances: SAMPLE });
  return { db, projectId: project.id, ids: utteranceIds };
}

async function opened(db: SlotsmithDb, key: LayerKey, who = key[1]): Promise<LabelEditor> {
  const editor = new LabelEditor(db, who);
  const utterance = await db.utterances.get(key[0]);
  editor.open(key, await layerGet(db, key), (utterance?.tokens.length ?? 0) / 2);
  return editor;
}

const spans = (tags: readonly string[] | undefined) => spansFromTags(tags ?? []).map((s) => `${s.slot}:${s.start}-${s.end}`);

describe('LabelEditor', () => {
  it('paints an edit at once, then saves each edit in order with the revision the last save returned', async () => {
    const { db, ids } = await seeded();
    const key: LayerKey = [ids[0] as number, 'ana'];
    const editor = await opened(db, key);
    let notified = 0;
    editor.subscribe(() => notified++);
    editor.edit({ kind: 'label', from: 2, to: 2, slot: 'service' });
    // Shown before any save has finished.
    expect(spans(editor.snapshot().edit?.tags)).toEqual(['service:2-3']);
    expect(editor.snapshot().saving).toBe(true);
    editor.edit({ kind: 'label', from: 4, to: 5, slot: 'day' });
    editor.edit({ kind: 'intent', intent: 'book_visit' });
    expect(spans(editor.snapshot().edit?.tags)).toEqual(['service:2-3', 'day:4-6']);
    expect(notified).toBeGreaterThanOrEqual(3);
    await editor.idle();
    const row = await layerGet(db, key);
    expect(row).toMatchObject({ revision: 3, intent: 'book_visit', status: 'draft', tags: ['O', 'O', 'B-service', 'O', 'B-day', 'I-day'] });
    expect((await layerHistory(db, key)).map((h) => h.after.revision)).toEqual([3, 2, 1]);
    expect(editor.snapshot()).toMatchObject({ revision: 3, saving: false, canUndo: true, canRedo: false, error: null });
  });

  it('a save on a stale revision becomes a conflict; keeping theirs shows theirs and stores nothing more', async () => {
    const { db, ids } = await seeded();
    const key: LayerKey = [ids[0] as number, 'ana'];
    const tabA = await opened(db, key);
    const tabB = await opened(db, key);
    tabB.edit({ kind: 'label', from: 0, to: 0, slot: 'area' });
    await tabB.idle();
    tabA.edit({ kind: 'label', from: 4, to: 4, slot: 'day' });
    await tabA.idle();
    const conflict = tabA.snapshot().conflict;
    expect(conflict).not.toBeNull();
    expect(spans(conflict?.theirs.tags)).toEqual(['area:0-1']);
    expect(spans(conflict?.mine.tags)).toEqual(['day:4-5']);
    expect(spans(conflict?.mineOnTheirs.tags)).toEqual(['area:0-1', 'day:4-5']);
    // Still shown as the user left it, nothing overwritten.
    expect(spans(tabA.snapshot().edit?.tags)).toEqual(['day:4-5']);
    expect((await layerGet(db, key))?.revision).toBe(1);
    // Further edits wait until the conflict is settled.
    tabA.edit({ kind: 'label', from: 1, to: 1, slot: 'service' });
    expect(spans(tabA.snapshot().edit?.tags)).toEqual(['day:4-5']);
    tabA.conflictKeepTheirs();
    await tabA.idle();
    expect(tabA.snapshot().conflict).toBeNull();
    expect(spans(tabA.snapshot().edit?.tags)).toEqual(['area:0-1']);
    expect((await layerGet(db, key))?.revision).toBe(1);
    // The next edit goes on top of theirs without another conflict.
    tabA.edit({ kind: 'status', status: 'done' });
    await tabA.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 2, status: 'done', tags: ['B-area', 'O', 'O', 'O', 'O', 'O'] });
  });

  it('"apply mine on top" replays this tab\'s edits on the other version; both stay in the history', async () => {
    const { db, ids } = await seeded();
    const key: LayerKey = [ids[0] as number, 'ana'];
    const tabA = await opened(db, key);
    const tabB = await opened(db, key);
    tabB.edit({ kind: 'label', from: 0, to: 0, slot: 'area' });
    await tabB.idle();
    tabA.edit({ kind: 'label', from: 4, to: 5, slot: 'day' });
    tabA.edit({ kind: 'note', note: 'asked twice' });
    await tabA.idle();
    expect(tabA.snapshot().conflict?.mine.note).toBe('asked twice');
    tabA.conflictApplyMine();
    await tabA.idle();
    const row = await layerGet(db, key);
    expect(spans(row?.tags)).toEqual(['area:0-1', 'day:4-6']);
    expect(row).toMatchObject({ note: 'asked twice', revision: 3 });
    const history = await layerHistory(db, key);
    expect(history.map((h) => spans(h.after.tags))).toEqual([['area:0-1', 'day:4-6'], ['area:0-1', 'day:4-6'], ['area:0-1']]);
    // Tab B's own version is recoverable: it is the `before` of tab A's first write.
    expect(spans(history[1]?.before?.tags)).toEqual(['area:0-1']);
  });

  it('undo and redo across utterances write new revisions and ask the screen to go there', async () => {
    const { db, ids } = await seeded();
    const k1: LayerKey = [ids[0] as number, 'ana'];
    const k2: LayerKey = [ids[1] as number, 'ana'];
    const editor = await opened(db, k1);
    const visited: number[] = [];
    editor.navigateSet((id) => {
      visited.push(id);
      void db.utterances.get(id).then(async (u) => editor.open([id, 'ana'], await layerGet(db, [id, 'ana']), (u?.tokens.length ?? 0) / 2));
    });
    editor.edit({ kind: 'label', from: 4, to: 4, slot: 'day' });
    await editor.idle();
    editor.open(k2, await layerGet(db, k2), 5);
    // Stored as imported with an illegal I-day: the first edit writes it legally.
    editor.edit({ kind: 'label', from: 0, to: 0, slot: 'service' });
    await editor.idle();
    expect((await layerGet(db, k2))?.tags).toEqual(['B-service', 'O', 'O', 'O', 'O']);
    editor.undo();
    await editor.idle();
    expect(await layerGet(db, k2)).toMatchObject({ revision: 2, status: 'unlabelled', tags: ['O', 'O', 'O', 'O', 'O'] });
    editor.undo();
    await editor.idle();
    expect(visited).toEqual([ids[0]]);
    expect(await layerGet(db, k1)).toMatchObject({ revision: 2, tags: ['O', 'O', 'O', 'O', 'O', 'O'] });
    expect(editor.snapshot()).toMatchObject({ canUndo: false, canRedo: true, redoUtterance: ids[0] });
    editor.redo();
    await editor.idle();
    expect((await layerGet(db, k1))?.tags).toEqual(['O', 'O', 'O', 'O', 'B-day', 'O']);
    editor.redo();
    await editor.idle();
    expect(visited).toEqual([ids[0], ids[1]]);
    expect(await layerGet(db, k2)).toMatchObject({ revision: 3, tags: ['B-service', 'O', 'O', 'O', 'O'] });
    expect(editor.snapshot().canRedo).toBe(false);
  });

  it('quick undo presses wait their turn: three presses undo three edits', async () => {
    const { db, ids } = await seeded();
    const key: LayerKey = [ids[0] as number, 'ana'];
    const editor = await opened(db, key);
    editor.edit({ kind: 'label', from: 0, to: 0, slot: 'area' });
    editor.edit({ kind: 'note', note: 'n' });
    editor.edit({ kind: 'status', status: 'flagged' });
    editor.edit({ kind: 'intent', intent: 'cancel' });
    await editor.idle();
    editor.undo();
    editor.undo();
    editor.undo();
    await editor.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 7, tags: ['B-area', 'O', 'O', 'O', 'O', 'O'], note: '', status: 'draft', intent: null });
    editor.redo();
    editor.redo();
    await editor.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 9, note: 'n', status: 'flagged', intent: null });
  });

  it('an undo over a change made elsewhere asks first; keeping theirs drops that undo step', async () => {
    const { db, ids } = await seeded();
    const key: LayerKey = [ids[0] as number, 'ana'];
    const editor = await opened(db, key);
    editor.edit({ kind: 'label', from: 2, to: 2, slot: 'service' });
    await editor.idle();
    await layerSave(db, key, { intent: 'cancel' }, { expectedRevision: 1, who: 'ana' });
    editor.undo();
    await editor.idle();
    expect(editor.snapshot().conflict).toMatchObject({ cause: 'undo', theirs: { intent: 'cancel', revision: 2 } });
    expect((await layerGet(db, key))?.revision).toBe(2);
    editor.conflictKeepTheirs();
    expect(editor.snapshot()).toMatchObject({ canUndo: false, conflict: null });
    expect(await layerGet(db, key)).toMatchObject({ revision: 2, intent: 'cancel' });
  });

  it('a newer version stored elsewhere is offered, not swapped in; undo steps come back after a reload', async () => {
    const { db, projectId, ids } = await seeded();
    const key: LayerKey = [ids[0] as number, 'ana'];
    const editor = await opened(db, key);
    editor.edit({ kind: 'label', from: 2, to: 2, slot: 'service' });
    await editor.idle();
    const other = await layerSave(db, key, { note: 'from the other tab' }, { expectedRevision: 1, who: 'ana' });
    editor.storedSeen(key, other);
    expect(editor.snapshot().newer?.note).toBe('from the other tab');
    expect(editor.snapshot().edit?.note).toBe('');
    editor.newerTake();
    expect(editor.snapshot()).toMatchObject({ newer: null, revision: 2, edit: { note: 'from the other tab' } });

    const reloaded = await opened(db, key);
    expect(reloaded.snapshot().canUndo).toBe(false);
    await reloaded.undoSeed(projectId, ['ana']);
    expect(reloaded.snapshot().canUndo).toBe(true);
    reloaded.undo();
    await reloaded.idle();
    expect(await layerGet(db, key)).toMatchObject({ revision: 3, note: '' });
  });
});
