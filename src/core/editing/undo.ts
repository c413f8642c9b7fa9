/**
 * Undo and redo across utterances. An entry records one saved edit of one layer: the content before,
 * and the content and revision after. Undo writes `before` back as a new revision (the history table
 * records it like any edit); redo writes `after` again. Both check first that the layer still holds
 * what the entry left there, so an edit made elsewhere in between is never silently undone.
 */
import type { LayerEdit } from './content';
import { layerEditSame } from './content';

export interface UndoEntry {
  utteranceId: number;
  annotator: string;
  before: LayerEdit;
  /** What the edit stored, and the revision it got. */
  after: LayerEdit & { revision: number };
}

/**
 * Both stacks hold entries the same way round: applying one writes its `before` once the stored layer
 * is found to hold its `after`. A redo entry is therefore the undone entry inverted.
 */
export interface UndoStacks {
  undo: readonly UndoEntry[];
  redo: readonly UndoEntry[];
}

/** Enough for a working session; older steps stay recoverable through the history table. */
export const UNDO_DEPTH = 200;

export const UNDO_EMPTY: UndoStacks = { undo: [], redo: [] };

function capped(entries: readonly UndoEntry[]): readonly UndoEntry[] {
  return entries.length > UNDO_DEPTH ? entries.slice(entries.length - UNDO_DEPTH) : entries;
}

/** A new edit was saved: it can be undone, and whatever was undone before can no longer be redone. */
export function undoRecord(stacks: UndoStacks, entry: UndoEntry): UndoStacks {
  return { undo: capped([...stacks.undo, entry]), redo: [] };
}

export function undoPeek(stacks: UndoStacks): UndoEntry | null {
  return stacks.undo[stacks.undo.length - 1] ?? null;
}

export function redoPeek(stacks: UndoStacks): UndoEntry | null {
  return stacks.redo[stacks.redo.length - 1] ?? null;
}

/**
 * The top undo entry was written back as revision `revision`: it moves to the redo stack, where redo
 * expects to find the entry's `before` content stored under that revision.
 */
export function undoDone(stacks: UndoStacks, revision: number): UndoStacks {
  const entry = undoPeek(stacks);
  if (entry === null) return stacks;
  const redone: UndoEntry = { ...entry, before: entry.after, after: { ...entry.before, revision } };
  return { undo: stacks.undo.slice(0, -1), redo: [...stacks.redo, redone] };
}

/** The top redo entry was written again as revision `revision`: it is undoable once more. */
export function redoDone(stacks: UndoStacks, revision: number): UndoStacks {
  const entry = redoPeek(stacks);
  if (entry === null) return stacks;
  const again: UndoEntry = { ...entry, before: entry.after, after: { ...entry.before, revision } };
  return { undo: capped([...stacks.undo, again]), redo: stacks.redo.slice(0, -1) };
}

/** Drop the top entry of one stack (after the user chose to keep another tab's version instead). */
export function undoDrop(stacks: UndoStacks, which: 'undo' | 'redo'): UndoStacks {
  return which === 'undo' ? { undo: stacks.undo.slice(0, -1), redo: stacks.redo } : { undo: stacks.undo, redo: stacks.redo.slice(0, -1) };
}

/**
 * Whether reversing `entry` is safe: the stored layer still holds what the entry left (compared by
 * content, not revision: undoing then redoing restores content under a new revision).
 */
export function undoApplies(entry: UndoEntry, stored: LayerEdit): boolean {
  return layerEditSame(entry.after, stored);
}
