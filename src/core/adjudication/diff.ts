/**
 * Where two layers of one utterance disagree. Both layers label the same tokens, so alignment is by
 * token index; spans are read leniently (`spansFromTags`, the CoNLL-2000 reading), so a stray I-X in
 * one layer and B-X in the other mark the same span and are not a disagreement about content.
 */
import { spansFromTags } from '../schemes/codec';
import type { Span } from '../types';

/**
 * One disagreement: a token range [start, end) holding the spans of A and of B that the other layer
 * lacks. Overlapping spans are merged into one region, so taking one side replaces the whole range.
 */
export interface DiffRegion {
  start: number;
  end: number;
  a: Span[];
  b: Span[];
}

export interface AdjudicationDiff {
  length: number;
  /** Spans both layers have exactly (same tokens, same slot). */
  agreed: Span[];
  /** Disagreements in token order; disjoint and never touching an agreed span. */
  regions: DiffRegion[];
}

function spanKey(span: Span): string {
  return `${span.start}:${span.end}:${span.slot}`;
}

export function adjudicationDiff(a: readonly string[], b: readonly string[]): AdjudicationDiff {
  const length = Math.max(a.length, b.length);
  const spansA = spansFromTags(a);
  const spansB = spansFromTags(b);
  const keysA = new Set(spansA.map(spanKey));
  const keysB = new Set(spansB.map(spanKey));
  const agreed = spansA.filter((s) => keysB.has(spanKey(s)));
  const loose = [
    ...spansA.filter((s) => !keysB.has(spanKey(s))).map((span) => ({ span, side: 'a' as const })),
    ...spansB.filter((s) => !keysA.has(spanKey(s))).map((span) => ({ span, side: 'b' as const })),
  ].sort((x, y) => x.span.start - y.span.start || x.span.end - y.span.end);
  const regions: DiffRegion[] = [];
  let open: DiffRegion | null = null;
  for (const { span, side } of loose) {
    if (open === null || span.start >= open.end) {
      open = { start: span.start, end: span.end, a: [], b: [] };
      regions.push(open);
    }
    open.end = Math.max(open.end, span.end);
    open[side].push({ ...span });
  }
  return { length, agreed, regions };
}

/** Whether two intents differ; a missing intent (null or empty) differs from any named one. */
export function intentsDiffer(a: string | null | undefined, b: string | null | undefined): boolean {
  return (a ?? '') !== (b ?? '');
}
