/**
 * Token-range labelling on IOB2 tag arrays. Input tags are read leniently (`spansFromTags`, the
 * CoNLL-2000 reading: a stray I-X opens a span; unparseable tags read as O), and every result is
 * written back as legal IOB2, so an edit also cleans the layer it touches.
 *
 * Ranges are inclusive token indices [from, to], in either order (a selection's anchor may lie after
 * its focus). Out-of-range indices are clamped to the utterance.
 */
import { spansFromTags, tagsFromSpans } from '../schemes';
import type { Span } from '../types';

export interface TokenRange {
  /** First token, inclusive. */
  from: number;
  /** Last token, inclusive. */
  to: number;
}

/** [from, to] sorted and clamped to [0, length - 1]; null for an empty utterance. */
export function rangeNormalise(from: number, to: number, length: number): TokenRange | null {
  if (length <= 0) return null;
  const clamp = (i: number) => Math.min(length - 1, Math.max(0, Math.trunc(i)));
  const a = clamp(from);
  const b = clamp(to);
  return a <= b ? { from: a, to: b } : { from: b, to: a };
}

/** The tags as legal IOB2, read the CoNLL-2000 way. */
export function tagsLegalise(tags: readonly string[]): string[] {
  return tagsFromSpans(spansFromTags(tags), tags.length, 'iob2');
}

/** The span covering `tokenIndex`, or null when that token is outside every span. */
export function spanAt(tags: readonly string[], tokenIndex: number): Span | null {
  return spansFromTags(tags).find((s) => s.start <= tokenIndex && tokenIndex < s.end) ?? null;
}

function overlaps(span: Span, range: TokenRange): boolean {
  return span.start <= range.to && span.end > range.from;
}

/**
 * Label tokens [from, to] with `slot`. Every existing span that overlaps the range is removed
 * entirely, also when it only partly overlaps: relabelling across a boundary usually means that
 * boundary was wrong, and trimming would leave a fragment labelled that the annotator never chose.
 */
export function spanLabel(tags: readonly string[], from: number, to: number, slot: string): string[] {
  const range = rangeNormalise(from, to, tags.length);
  if (range === null) return [];
  const kept = spansFromTags(tags).filter((s) => !overlaps(s, range));
  const spans = [...kept, { start: range.from, end: range.to + 1, slot }].sort((a, b) => a.start - b.start);
  return tagsFromSpans(spans, tags.length, 'iob2');
}

/** Remove the span covering `tokenIndex` (no change but legalising when there is none). */
export function spanRemove(tags: readonly string[], tokenIndex: number): string[] {
  const spans = spansFromTags(tags).filter((s) => !(s.start <= tokenIndex && tokenIndex < s.end));
  return tagsFromSpans(spans, tags.length, 'iob2');
}

/** Remove every span that overlaps [from, to] (Delete on a selection). */
export function spansRemoveIn(tags: readonly string[], from: number, to: number): string[] {
  const range = rangeNormalise(from, to, tags.length);
  if (range === null) return [];
  return tagsFromSpans(spansFromTags(tags).filter((s) => !overlaps(s, range)), tags.length, 'iob2');
}
