import { tagsConvert } from '../schemes';
import type { LabelledUtterance } from './types';

/**
 * Case folding by `toLowerCase` (locale-independent); full Unicode case folding would also map
 * ß to ss, which is rare enough in utterances to ignore (common practice, no source).
 */
export function tokenFold(token: string): string {
  return token.toLowerCase();
}

/**
 * Tags padded or cut to the token count (missing tags read as O) and rewritten as legal IOB2, so a
 * stray I-X reads as the start of a span, following the CoNLL-2000 convention of `spansFromTags`.
 */
export function tagsNormalise(utterance: LabelledUtterance): string[] {
  const length = utterance.tokens.length;
  const padded = Array.from({ length }, (_, i) => utterance.tags[i] ?? 'O');
  return tagsConvert(padded, 'iob2');
}

/** Stable ordering of strings independent of locale (code-unit order). */
export function stringCompare(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Order locations by layer, id, then start, so outputs do not depend on input order. */
export function locationCompare(
  a: { id: string; layer: string; start: number },
  b: { id: string; layer: string; start: number },
): number {
  return stringCompare(a.layer, b.layer) || stringCompare(a.id, b.id) || a.start - b.start;
}
