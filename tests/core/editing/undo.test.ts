import { describe, expect, it } from 'vitest';
import {
  editApply,
  layerEditBlank,
  redoDone,
  redoPeek,
  UNDO_DEPTH,
  UNDO_EMPTY,
  undoApplies,
  undoDone,
  undoDrop,
  undoPeek,
  undoRecord,
  type LayerEdit,
  type UndoEntry,
  type UndoStacks,
} from '../../../src/core/editing';

/** A fake store of layers keyed by utterance, revision counting as layerSave does (+1 per write). */
function store() {
  const layers = new Map<number, LayerEdit & { revision: number }>();
  return {
    get: (id: number) => layers.get(id) ?? { ...layerEditBlank(3), revision: 0 },
    write(id: number, edit: LayerEdit) {
      const next = { ...edit, revision: this.get(id).revision + 1 };
      layers.set(id, next);
      return next;
    },
  };
}

describe('undo stacks', () => {
  it('undo and redo across two utterances restore content in order; each step is a new revision', () => {
    const s = store();
    let stacks: UndoStacks = UNDO_EMPTY;
    const edit = (id: number, slot: string) => {
      const before = s.get(id);
      const after = s.write(id, editApply(before, { kind: 'label', from: 0, to: 1, slot }));
      stacks = undoRecord(stacks, { utteranceId: id, annotator: 'ann-a', before, after });
    };
    const undo = () => {
      const e = undoPeek(stacks) as UndoEntry;
      expect(undoApplies(e, s.get(e.utteranceId))).toBe(true);
      stacks = undoDone(stacks, s.write(e.utteranceId, e.before).revision);
      return e.utteranceId;
    };
    const redo = () => {
      const e = redoPeek(stacks) as UndoEntry;
      expect(undoApplies(e, s.get(e.utteranceId))).toBe(true);
      stacks = redoDone(stacks, s.write(e.utteranceId, e.before).revision);
      return e.utteranceId;
    };
    edit(1, 'day');
    edit(2, 'area');
    edit(1, 'service');
    expect(undo()).toBe(1);
    expect(s.get(1).tags).toEqual(['B-day', 'I-day', 'O']);
    expect(undo()).toBe(2);
    expect(s.get(2).tags).toEqual(['O', 'O', 'O']);
    expect(undo()).toBe(1);
    expect(s.get(1)).toMatchObject({ tags: ['O', 'O', 'O'], status: 'unlabelled', revision: 4 });
    expect(undoPeek(stacks)).toBeNull();
    expect(redo()).toBe(1);
    expect(redo()).toBe(2);
    expect(redo()).toBe(1);
    expect(s.get(1)).toMatchObject({ tags: ['B-service', 'I-service', 'O'], revision: 6 });
    expect(s.get(2)).toMatchObject({ tags: ['B-area', 'I-area', 'O'], revision: 3 });
    expect(redoPeek(stacks)).toBeNull();
    // Undo works again after redo, against the newer revisions.
    expect(undo()).toBe(1);
    expect(s.get(1).tags).toEqual(['B-day', 'I-day', 'O']);
  });

  it('a new edit clears the redo stack; a change made elsewhere blocks the undo', () => {
    const before = layerEditBlank(2);
    const after = { ...before, tags: ['B-day', 'O'], status: 'draft' as const, revision: 1 };
    let stacks = undoRecord(UNDO_EMPTY, { utteranceId: 7, annotator: 'ben', before, after });
    stacks = undoDone(stacks, 2);
    expect(stacks.redo).toHaveLength(1);
    stacks = undoRecord(stacks, { utteranceId: 7, annotator: 'ben', before, after: { ...after, revision: 3 } });
    expect(stacks.redo).toHaveLength(0);
    const top = undoPeek(stacks) as UndoEntry;
    expect(undoApplies(top, { ...after, tags: ['B-area', 'O'] })).toBe(false);
    expect(undoApplies(top, after)).toBe(true);
    expect(undoDrop(stacks, 'undo').undo).toHaveLength(0);
  });

  it('keeps at most UNDO_DEPTH steps, dropping the oldest', () => {
    let stacks: UndoStacks = UNDO_EMPTY;
    const blank = layerEditBlank(1);
    for (let i = 0; i < UNDO_DEPTH + 5; i++) stacks = undoRecord(stacks, { utteranceId: i, annotator: 'a', before: blank, after: { ...blank, revision: 1 } });
    expect(stacks.undo).toHaveLength(UNDO_DEPTH);
    expect(stacks.undo[0]?.utteranceId).toBe(5);
  });
});
