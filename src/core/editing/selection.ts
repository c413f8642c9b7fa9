/**
 * The token selection of the span editor: an anchor (where the selection started) and a focus (the
 * end that moves), both token indices, as in a text field's selection. Always snapped to tokens.
 */
import type { Span, Token } from '../types';
import { rangeNormalise, spanAt, type TokenRange } from './spans';

export interface TokenSelection {
  anchor: number;
  focus: number;
}

export function selectionCaret(index: number): TokenSelection {
  return { anchor: index, focus: index };
}

export function selectionIsCaret(selection: TokenSelection): boolean {
  return selection.anchor === selection.focus;
}

/** The selected tokens as a sorted inclusive range (null for an empty utterance). */
export function selectionRange(selection: TokenSelection, length: number): TokenRange | null {
  return rangeNormalise(selection.anchor, selection.focus, length);
}

/** Kept inside [0, length - 1]: a stored selection may outlive a shorter utterance. */
export function selectionClamp(selection: TokenSelection, length: number): TokenSelection {
  const clamp = (i: number) => Math.min(Math.max(0, length - 1), Math.max(0, i));
  return { anchor: clamp(selection.anchor), focus: clamp(selection.focus) };
}

/**
 * Arrow keys: move the focus by `delta` tokens. With `extend` (shift) the anchor stays; without, the
 * selection collapses to a caret, and a range collapses to its own edge in the arrow's direction first.
 */
export function selectionMove(selection: TokenSelection, delta: number, length: number, extend: boolean): TokenSelection {
  if (length <= 0) return selectionCaret(0);
  const clamp = (i: number) => Math.min(length - 1, Math.max(0, i));
  if (extend) return { anchor: clamp(selection.anchor), focus: clamp(selection.focus + delta) };
  if (!selectionIsCaret(selection)) {
    const low = Math.min(selection.anchor, selection.focus);
    const high = Math.max(selection.anchor, selection.focus);
    return selectionCaret(clamp(delta < 0 ? low : high));
  }
  return selectionCaret(clamp(selection.focus + delta));
}

/** A click on a labelled token selects its whole span (to relabel or remove it); elsewhere a caret. */
export function selectionFromClick(tags: readonly string[], index: number): TokenSelection {
  const span = spanAt(tags, index);
  return span === null ? selectionCaret(index) : selectionOfSpan(span);
}

export function selectionOfSpan(span: Span): TokenSelection {
  return { anchor: span.start, focus: span.end - 1 };
}

/**
 * The tokens a slot key labels: a caret inside a span means that whole span (relabel it); otherwise
 * the selected range.
 */
export function selectionTarget(tags: readonly string[], selection: TokenSelection): TokenRange | null {
  if (selectionIsCaret(selection)) {
    const span = spanAt(tags, selection.focus);
    if (span !== null) return { from: span.start, to: span.end - 1 };
  }
  return selectionRange(selection, tags.length);
}

/**
 * The token for a text offset (UTF-16), for snapping a mouse drag that ends between tokens: the token
 * containing it, else the nearest one (ties go to the earlier token). -1 when there are no tokens.
 */
export function tokenIndexAt(tokens: readonly Token[], offset: number): number {
  if (tokens.length === 0) return -1;
  let low = 0;
  let high = tokens.length - 1;
  while (low < high) {
    const middle = (low + high) >> 1;
    if ((tokens[middle] as Token).end <= offset) low = middle + 1;
    else high = middle;
  }
  const token = tokens[low] as Token;
  if (offset >= token.start || low === 0) return low;
  const before = tokens[low - 1] as Token;
  return offset - before.end <= token.start - offset ? low - 1 : low;
}
