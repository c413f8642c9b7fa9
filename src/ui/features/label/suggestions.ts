/**
 * Model suggestions in the span editor: which spans of the `model` layer to offer, which one a key
 * acts on, and the edit that accepts them. Plain functions, so they are tested without a browser.
 */
import { selectionRange, type EditOp, type TokenSelection } from '../../../core/editing';
import { spansFromTags } from '../../../core/schemes';
import type { Span } from '../../../core/types';

export interface Suggestion extends Span {
  /** Content key (`start:end:slot`): a rejection is remembered by it. */
  key: string;
}

export function suggestionKey(span: Span): string {
  return `${span.start}:${span.end}:${span.slot}`;
}

/**
 * The model's spans over tokens the labeller has not labelled, minus rejected ones. Model tags are
 * read the CoNLL-2000 way (any scheme); a layer of another token count (a stale model layer) offers
 * nothing, and `known` (the schema's slots) drops suggestions for slots no longer in the schema.
 */
export function suggestionsFor(modelTags: readonly string[] | undefined, ownTags: readonly string[], rejected: ReadonlySet<string>, known: ReadonlySet<string> | null = null): Suggestion[] {
  if (modelTags === undefined || modelTags.length !== ownTags.length) return [];
  const covered = new Uint8Array(ownTags.length);
  for (const s of spansFromTags(ownTags)) covered.fill(1, s.start, s.end);
  const out: Suggestion[] = [];
  for (const span of spansFromTags(modelTags)) {
    if (known !== null && !known.has(span.slot)) continue;
    if (covered.subarray(span.start, span.end).some((c) => c === 1)) continue;
    const key = suggestionKey(span);
    if (!rejected.has(key)) out.push({ ...span, key });
  }
  return out;
}

/** Suggestions hidden by this labeller's rejections (they come back with "show again"). */
export function suggestionsRejectedCount(modelTags: readonly string[] | undefined, ownTags: readonly string[], rejected: ReadonlySet<string>, known: ReadonlySet<string> | null = null): number {
  if (rejected.size === 0) return 0;
  const all = suggestionsFor(modelTags, ownTags, new Set(), known);
  return all.filter((s) => rejected.has(s.key)).length;
}

/**
 * The suggestion a one-span key acts on: the first that overlaps the selection, else the first that
 * starts after it, else the first of the utterance (so repeated presses walk through all of them).
 */
export function suggestionAtSelection(suggestions: readonly Suggestion[], selection: TokenSelection, tokenCount: number): Suggestion | null {
  const range = selectionRange(selection, tokenCount);
  if (range === null) return suggestions[0] ?? null;
  return suggestions.find((s) => s.start <= range.to && s.end > range.from) ?? suggestions.find((s) => s.start > range.to) ?? suggestions[0] ?? null;
}

/** The label edit that accepts one suggestion: the ordinary span edit, so tags stay legal IOB2. */
export function suggestionAcceptOp(suggestion: Span): EditOp {
  return { kind: 'label', from: suggestion.start, to: suggestion.end - 1, slot: suggestion.slot };
}

/** Plain words for a screen reader and the suggestion list, e.g. `area “north end” (suggested)`. */
export function suggestionName(text: string, tokens: readonly { start: number; end: number }[], suggestion: Span): string {
  const first = tokens[suggestion.start];
  const last = tokens[suggestion.end - 1];
  const words = first === undefined || last === undefined ? '' : text.slice(first.start, last.end);
  return `${suggestion.slot} “${words}”`;
}

/** A suggested token's accessible name: says it is a suggestion, not a label (first token says "starts"). */
export function suggestionTokenName(tokenText: string, suggestion: Span, index: number): string {
  return `${tokenText}, suggested ${suggestion.slot}${suggestion.start === index ? ' (starts)' : ''}, not accepted`;
}
