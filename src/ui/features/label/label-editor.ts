/**
 * The span editor's working state, outside React so it can be tested against a real (fake) database.
 * An edit changes the shown layer at once (paint first), then joins a queue that saves edits one by
 * one with layerSave and the revision the previous save returned. A save refused because another tab
 * saved first stops the queue for that layer and becomes a `conflict` the user settles; nothing is
 * overwritten until they choose. Undo and redo go through the same queue.
 */
import {
  editApply,
  editChange,
  layerEditBlank,
  layerEditOf,
  layerEditSame,
  redoDone,
  redoPeek,
  UNDO_EMPTY,
  undoApplies,
  undoDone,
  undoDrop,
  undoPeek,
  undoRecord,
  type EditOp,
  type LayerEdit,
  type UndoEntry,
  type UndoStacks,
} from '../../../core/editing';
import { RevisionConflictError } from '../../../db/errors';
import { labelUndoSeed } from '../../../db/label-history';
import { layerSave } from '../../../db/layer-repo';
import type { LayerKey, LayerRow, SlotsmithDb } from '../../../db/schema';
import { tokensCount } from '../../../db/tokens';

export type StoredEdit = LayerEdit & { revision: number };
type ItemKind = 'edit' | 'undo' | 'redo';
/** Several edits saved as one (accepting every suggestion): one history row, one undo step. */
type QueuedOp = EditOp | { kind: 'batch'; ops: readonly EditOp[] };

function opApply(edit: LayerEdit, op: QueuedOp): LayerEdit {
  return op.kind === 'batch' ? op.ops.reduce((e, o) => editApply(e, o), edit) : editApply(edit, op);
}

interface QueueItem {
  key: LayerKey;
  op: QueuedOp;
  kind: ItemKind;
  entry?: UndoEntry;
  /** Set when the user chose "apply mine on top" after a conflict: no more checks but the revision. */
  force?: boolean;
}

export interface LabelConflict {
  key: LayerKey;
  cause: ItemKind;
  /** What is stored now (saved by another tab or window). */
  theirs: StoredEdit;
  /** What this tab meant to store, on the version it was showing. */
  mine: LayerEdit;
  /** What "apply mine on top" would store: this tab's edits replayed on their version. */
  mineOnTheirs: LayerEdit;
}

export interface LabelEditorView {
  key: LayerKey | null;
  /** The layer as shown: saved content with unsaved edits applied. */
  edit: LayerEdit | null;
  /** Revision of the last content known to be stored (0: no layer yet). */
  revision: number;
  saving: boolean;
  error: string | null;
  conflict: LabelConflict | null;
  /** A newer version of the shown layer, stored elsewhere while it was open. */
  newer: StoredEdit | null;
  canUndo: boolean;
  canRedo: boolean;
  /** Which utterance the next undo / redo would change. */
  undoUtterance: number | null;
  redoUtterance: number | null;
}

const keyText = (key: LayerKey) => `${key[0]}\u0000${key[1]}`;
const sameKey = (a: LayerKey | null, b: LayerKey) => a !== null && a[0] === b[0] && a[1] === b[1];

function stored(row: LayerRow | undefined, tokenCount: number): StoredEdit {
  return row === undefined ? { ...layerEditBlank(tokenCount), revision: 0 } : { ...layerEditOf(row), revision: row.revision };
}

function errorText(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

export class LabelEditor {
  private readonly confirmed = new Map<string, StoredEdit>();
  private queue: QueueItem[] = [];
  private running = false;
  private stacks: UndoStacks = UNDO_EMPTY;
  private current: LayerKey | null = null;
  private conflict: (LabelConflict & { items: QueueItem[] }) | null = null;
  private newer: StoredEdit | null = null;
  private error: string | null = null;
  private readonly listeners = new Set<() => void>();
  private idleWaiters: (() => void)[] = [];
  private reverseWaiting: ('undo' | 'redo')[] = [];
  private view: LabelEditorView;
  private onNavigate: (utteranceId: number) => void = () => undefined;

  constructor(
    private readonly db: SlotsmithDb,
    private readonly who: string,
  ) {
    this.view = this.viewBuild();
  }

  /** Called when undo or redo changes another utterance than the one shown, so the screen can go there. */
  navigateSet(onNavigate: (utteranceId: number) => void): void {
    this.onNavigate = onNavigate;
  }

  /** Fill the undo stack from the history table (after a reload), unless edits were made already. */
  async undoSeed(projectId: number, annotators: readonly string[], limit = 50): Promise<void> {
    const entries = await labelUndoSeed(this.db, projectId, this.who, annotators, limit);
    if (this.stacks.undo.length > 0 || this.stacks.redo.length > 0) return;
    this.stacks = { undo: entries, redo: [] };
    this.changed();
  }

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  snapshot = (): LabelEditorView => this.view;

  /** Show a layer. Unsaved edits of it (still queued) are kept; otherwise the stored row is taken. */
  open(key: LayerKey, row: LayerRow | undefined, tokenCount: number): void {
    const k = keyText(key);
    const pending = this.queue.some((i) => keyText(i.key) === k);
    const known = this.confirmed.get(k);
    const read = stored(row, tokenCount);
    // A read that raced this tab's own last save may be older than what the save returned.
    if (!pending && (known === undefined || read.revision >= known.revision)) this.confirmed.set(k, read);
    this.current = key;
    this.newer = null;
    this.error = null;
    this.changed();
  }

  /**
   * The stored layer as a live query sees it. A newer revision saved elsewhere is offered (`newer`),
   * not swapped in: the next key press must act on what the annotator is looking at.
   */
  storedSeen(key: LayerKey, row: LayerRow | undefined): void {
    if (!sameKey(this.current, key) || row === undefined) return;
    const mine = this.confirmed.get(keyText(key));
    const busy = this.queue.some((i) => sameKey(i.key, key)) || this.running;
    const next = mine !== undefined && row.revision > mine.revision && !busy ? stored(row, row.tags.length) : null;
    if (next?.revision === this.newer?.revision) return;
    this.newer = next;
    this.changed();
  }

  /** Take the newer stored version shown as `newer`. */
  newerTake(): void {
    if (this.current === null || this.newer === null) return;
    this.confirmed.set(keyText(this.current), this.newer);
    this.newer = null;
    this.changed();
  }

  /** Apply an edit to the shown layer now and queue its save. */
  edit(op: EditOp): void {
    if (this.current === null || this.conflict !== null) return;
    this.queue.push({ key: this.current, op, kind: 'edit' });
    this.changed();
    void this.run();
  }

  /** Apply several edits as one step (one save, one undo entry); nothing happens for none. */
  editAll(ops: readonly EditOp[]): void {
    if (ops.length === 0) return;
    if (ops.length === 1) return this.edit(ops[0] as EditOp);
    if (this.current === null || this.conflict !== null) return;
    this.queue.push({ key: this.current, op: { kind: 'batch', ops: [...ops] }, kind: 'edit' });
    this.changed();
    void this.run();
  }

  undo(): void {
    this.reverseWaiting.push('undo');
    this.reversePump();
  }

  redo(): void {
    this.reverseWaiting.push('redo');
    this.reversePump();
  }

  // One step at a time: the next step's entry depends on where this one lands, so quick presses wait here.
  private reversePump(): void {
    if (this.conflict !== null) this.reverseWaiting = [];
    if (this.queue.some((i) => i.kind !== 'edit')) return;
    const kind = this.reverseWaiting.shift();
    if (kind === undefined) return;
    const entry = kind === 'undo' ? undoPeek(this.stacks) : redoPeek(this.stacks);
    if (entry === null) {
      this.reverseWaiting = [];
      return;
    }
    const key: LayerKey = [entry.utteranceId, entry.annotator];
    this.queue.push({ key, op: { kind: 'replace', edit: entry.before }, kind, entry });
    this.changed();
    if (!sameKey(this.current, key)) this.onNavigate(entry.utteranceId);
    void this.run();
  }

  /** Settle a conflict by keeping the other version; this tab's edits are dropped (history keeps theirs and the earlier ones). */
  conflictKeepTheirs(): void {
    const c = this.conflict;
    if (c === null) return;
    this.confirmed.set(keyText(c.key), c.theirs);
    if (c.cause !== 'edit') this.stacks = undoDrop(this.stacks, c.cause);
    this.conflict = null;
    this.changed();
    void this.run();
  }

  /** Settle a conflict by replaying this tab's edits on the other version (both stay in the history). */
  conflictApplyMine(): void {
    const c = this.conflict;
    if (c === null) return;
    this.confirmed.set(keyText(c.key), c.theirs);
    this.queue.unshift(...c.items.map((i) => ({ ...i, force: true })));
    this.conflict = null;
    this.changed();
    void this.run();
  }

  /** Resolves once every queued save has finished (or stopped at a conflict or error). */
  idle(): Promise<void> {
    if (!this.running && (this.queue.length === 0 || this.conflict !== null)) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  private async base(key: LayerKey, fresh: boolean): Promise<StoredEdit> {
    const known = this.confirmed.get(keyText(key));
    if (known !== undefined && !fresh) return known;
    const [row, utterance] = await Promise.all([this.db.layers.get(key), this.db.utterances.get(key[0])]);
    const value = stored(row, utterance === undefined ? (row?.tags.length ?? 0) : tokensCount(utterance.tokens));
    this.confirmed.set(keyText(key), value);
    return value;
  }

  private conflictRaise(item: QueueItem, theirs: StoredEdit, mineBase: StoredEdit): void {
    const k = keyText(item.key);
    const items = this.queue.filter((i) => keyText(i.key) === k);
    this.queue = this.queue.filter((i) => keyText(i.key) !== k);
    const mine = items.reduce<LayerEdit>((edit, i) => opApply(edit, i.op), mineBase);
    const mineOnTheirs = items.reduce<LayerEdit>((edit, i) => opApply(edit, i.op), theirs);
    this.conflict = { key: item.key, cause: item.kind, theirs, mine, mineOnTheirs, items };
    this.reverseWaiting = [];
  }

  private async run(): Promise<void> {
    if (this.running) return;
    this.running = true;
    try {
      while (this.queue.length > 0 && this.conflict === null) {
        const item = this.queue[0] as QueueItem;
        // Undo and redo check the stored layer itself, which another tab may have changed.
        const base = await this.base(item.key, item.kind !== 'edit');
        if (item.kind !== 'edit' && item.entry !== undefined && item.force !== true && !undoApplies(item.entry, base)) {
          this.conflictRaise(item, base, { ...item.entry.after });
          break;
        }
        const target = opApply(base, item.op);
        const change = editChange(base, target);
        if (Object.keys(change).length === 0) {
          this.queue.shift();
          if (item.kind !== 'edit') this.stacks = item.kind === 'undo' ? undoDone(this.stacks, base.revision) : redoDone(this.stacks, base.revision);
          this.changed();
          if (item.kind !== 'edit') this.reversePump();
          continue;
        }
        let row: LayerRow;
        try {
          row = await layerSave(this.db, item.key, change, { expectedRevision: base.revision, who: this.who });
        } catch (caught) {
          if (caught instanceof RevisionConflictError) {
            const theirs = stored(caught.stored ?? undefined, base.tags.length);
            this.conflictRaise(item, theirs, base);
          } else {
            // Anything else (disk full, utterance deleted): drop this layer's queued edits, show the stored state.
            this.error = `Not saved: ${errorText(caught)}`;
            this.queue = this.queue.filter((i) => !sameKey(i.key, item.key));
            this.reverseWaiting = [];
            if (item.kind !== 'edit') this.stacks = undoDrop(this.stacks, item.kind);
          }
          this.changed();
          continue;
        }
        this.queue.shift();
        const after: StoredEdit = { ...layerEditOf(row), revision: row.revision };
        this.confirmed.set(keyText(item.key), after);
        if (item.kind === 'edit') this.stacks = undoRecord(this.stacks, { utteranceId: item.key[0], annotator: item.key[1], before: layerEditOf(base), after });
        else this.stacks = item.kind === 'undo' ? undoDone(this.stacks, row.revision) : redoDone(this.stacks, row.revision);
        this.error = null;
        this.changed();
        if (item.kind !== 'edit') this.reversePump();
      }
    } finally {
      this.running = false;
      this.changed();
      const waiters = this.idleWaiters;
      this.idleWaiters = [];
      for (const resolve of waiters) resolve();
    }
  }

  private viewBuild(): LabelEditorView {
    const key = this.current;
    const base = key === null ? undefined : this.confirmed.get(keyText(key));
    const c = this.conflict;
    let edit: LayerEdit | null = null;
    if (key !== null && base !== undefined) {
      edit = c !== null && sameKey(key, c.key) ? c.mine : this.queue.filter((i) => sameKey(i.key, key)).reduce<LayerEdit>((e, i) => opApply(e, i.op), base);
    }
    // Same content, same object: memoised parts of the screen then skip the repaint after each save.
    const previous = this.view?.edit ?? null;
    if (edit !== null && previous !== null && layerEditSame(edit, previous)) edit = previous;
    const conflict: LabelConflict | null = c === null ? null : { key: c.key, cause: c.cause, theirs: c.theirs, mine: c.mine, mineOnTheirs: c.mineOnTheirs };
    return {
      key,
      edit,
      revision: base?.revision ?? 0,
      saving: this.running || (this.queue.length > 0 && c === null),
      error: this.error,
      conflict,
      newer: this.newer,
      canUndo: this.stacks.undo.length > 0,
      canRedo: this.stacks.redo.length > 0,
      undoUtterance: undoPeek(this.stacks)?.utteranceId ?? null,
      redoUtterance: redoPeek(this.stacks)?.utteranceId ?? null,
    };
  }

  private changed(): void {
    this.view = this.viewBuild();
    for (const listener of this.listeners) listener();
  }
}

const editors = new Map<string, LabelEditor>();

/** One editor per database, project and person for the life of the tab, so undo survives leaving the screen. */
export function labelEditorFor(db: SlotsmithDb, projectId: number, who: string): LabelEditor {
  const id = `${db.name}\u0000${projectId}\u0000${who}`;
  let editor = editors.get(id);
  if (editor === undefined) {
    editor = new LabelEditor(db, who);
    editors.set(id, editor);
  }
  return editor;
}
