/**
 * What an annotator edits in one layer, and the edit operations of the span editor. An operation is
 * kept (not only its result) so that, after a conflict with another tab, the same operation can be
 * applied on top of the other version ("apply mine on top").
 */
import type { LayerContent, LayerStatus } from '../backup/model';
import { spanLabel, spansRemoveIn, tagsLegalise } from './spans';

/** The editable part of a layer (revision and time stamp belong to the store). */
export interface LayerEdit {
  tags: string[];
  intent: string | null;
  status: LayerStatus;
  note: string;
}

export type EditOp =
  | { kind: 'label'; from: number; to: number; slot: string }
  | { kind: 'remove'; from: number; to: number }
  | { kind: 'intent'; intent: string | null }
  | { kind: 'status'; status: LayerStatus }
  | { kind: 'note'; note: string }
  /** Write a whole earlier state back (undo, redo). */
  | { kind: 'replace'; edit: LayerEdit };

/** A layer that does not exist yet reads as this: nothing labelled, no intent. */
export function layerEditBlank(tokenCount: number): LayerEdit {
  return { tags: new Array<string>(tokenCount).fill('O'), intent: null, status: 'unlabelled', note: '' };
}

export function layerEditOf(content: LayerContent | LayerEdit): LayerEdit {
  return { tags: [...content.tags], intent: content.intent, status: content.status, note: content.note };
}

export function layerEditSame(a: LayerEdit, b: LayerEdit): boolean {
  return a.intent === b.intent && a.status === b.status && a.note === b.note && a.tags.length === b.tags.length && a.tags.every((t, i) => t === b.tags[i]);
}

// Any labelling work moves a layer out of 'unlabelled', so "next unlabelled" skips it afterwards.
function started(status: LayerStatus): LayerStatus {
  return status === 'unlabelled' ? 'draft' : status;
}

/** The layer after `op`. Tag operations always leave legal IOB2 (see spans.ts). */
export function editApply(edit: LayerEdit, op: EditOp): LayerEdit {
  switch (op.kind) {
    case 'label':
      return { ...edit, tags: spanLabel(edit.tags, op.from, op.to, op.slot), status: started(edit.status) };
    case 'remove':
      return { ...edit, tags: spansRemoveIn(edit.tags, op.from, op.to), status: started(edit.status) };
    case 'intent':
      return { ...edit, intent: op.intent, status: started(edit.status) };
    case 'status':
      return { ...edit, status: op.status };
    case 'note':
      return { ...edit, note: op.note };
    case 'replace':
      return layerEditOf(op.edit);
  }
}

/** Only the fields that differ, as a layer change (tags legalised only when they are written anyway). */
export function editChange(before: LayerEdit, after: LayerEdit): Partial<LayerEdit> {
  const change: Partial<LayerEdit> = {};
  const tagsDiffer = before.tags.length !== after.tags.length || before.tags.some((t, i) => t !== after.tags[i]);
  if (tagsDiffer) change.tags = [...after.tags];
  if (before.intent !== after.intent) change.intent = after.intent;
  if (before.status !== after.status) change.status = after.status;
  if (before.note !== after.note) change.note = after.note;
  return change;
}

/** True when a tag operation would also rewrite illegal stored tags (the UI says so before the first edit). */
export function tagsNeedLegalising(tags: readonly string[]): boolean {
  const legal = tagsLegalise(tags);
  return legal.some((t, i) => t !== tags[i]);
}
