/**
 * The gold layer being built: a span list edited region by region, written out as tags only at the
 * end, so every intermediate state encodes to a legal sequence of the project's scheme.
 */
import { tagsFromSpans } from '../schemes/codec';
import type { Scheme, Span } from '../types';
import type { AdjudicationDiff, DiffRegion } from './diff';

export type Side = 'a' | 'b';

function spansSorted(spans: readonly Span[]): Span[] {
  return [...spans].sort((x, y) => x.start - y.start || x.end - y.end);
}

/**
 * Remove tokens [start, end) from every span: a span partly inside keeps its parts outside the
 * range (so taking one side of a region never eats into a neighbouring decision).
 */
export function spansCut(spans: readonly Span[], start: number, end: number): Span[] {
  const kept: Span[] = [];
  for (const span of spans) {
    if (span.end <= start || span.start >= end) {
      kept.push({ ...span });
      continue;
    }
    if (span.start < start) kept.push({ start: span.start, end: start, slot: span.slot });
    if (span.end > end) kept.push({ start: end, end: span.end, slot: span.slot });
  }
  return spansSorted(kept);
}

/** Label tokens [start, end) with `slot` (null clears them); other spans are trimmed around it. */
export function spansPlace(spans: readonly Span[], start: number, end: number, slot: string | null): Span[] {
  const kept = spansCut(spans, start, end);
  if (slot === null || end <= start) return kept;
  return spansSorted([...kept, { start, end, slot }]);
}

/** Replace the region's tokens with one side's spans there. */
export function spansTake(spans: readonly Span[], region: DiffRegion, side: Side): Span[] {
  return spansSorted([...spansCut(spans, region.start, region.end), ...region[side].map((s) => ({ ...s }))]);
}

/** The starting point before any decision: what both layers agree on, nothing in the disputed regions. */
export function draftStart(diff: AdjudicationDiff): Span[] {
  return diff.agreed.map((s) => ({ ...s }));
}

/** Gold tags from the draft spans: always a legal sequence of `scheme` (spans clipped to the utterance). */
export function goldTags(spans: readonly Span[], length: number, scheme: Scheme): string[] {
  const inside = spans
    .map((s) => ({ start: Math.max(0, s.start), end: Math.min(length, s.end), slot: s.slot }))
    .filter((s) => s.end > s.start);
  // Overlaps cannot arise from the operations above; a hand-made overlapping list keeps the earlier span.
  const clean: Span[] = [];
  for (const span of spansSorted(inside)) {
    const last = clean[clean.length - 1];
    if (last !== undefined && span.start < last.end) continue;
    clean.push(span);
  }
  return tagsFromSpans(clean, length, scheme);
}
