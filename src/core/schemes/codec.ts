import type { Scheme, Span } from '../types';
import { tagFormat, tagParse } from './tag';

/**
 * Decode tags to spans (token indices, end exclusive). One lenient reading serves IOB1, IOB2 and
 * BIOES: it is exact on legal sequences of each scheme, and on illegal ones it follows the
 * CoNLL-2000 evaluation convention (a stray I-X, or E-X, starts a new span rather than being
 * dropped), which is what NLTK's `conlltags2tree` does too. Unparseable tags read as O.
 */
export function spansFromTags(tags: readonly string[]): Span[] {
  const spans: Span[] = [];
  let open: Span | null = null;
  for (let i = 0; i < tags.length; i++) {
    const parsed = tagParse(tags[i] ?? 'O');
    if (parsed === null || parsed.prefix === 'O') {
      open = null;
      continue;
    }
    const { prefix, slot } = parsed;
    const continues = (prefix === 'I' || prefix === 'E') && open !== null && open.slot === slot;
    if (continues && open !== null) {
      open.end = i + 1;
    } else {
      open = { start: i, end: i + 1, slot };
      spans.push(open);
    }
    if (prefix === 'E' || prefix === 'S') open = null;
  }
  return spans;
}

/** Check spans are sorted, non-overlapping, non-empty and inside [0, length). */
export function spansAreWellFormed(spans: readonly Span[], length: number): boolean {
  let previousEnd = 0;
  for (const span of spans) {
    if (!(span.start >= previousEnd && span.end > span.start && span.end <= length)) return false;
    previousEnd = span.end;
  }
  return true;
}

/** Encode spans (sorted, non-overlapping) as tags of the given scheme. */
export function tagsFromSpans(spans: readonly Span[], length: number, scheme: Scheme): string[] {
  if (!spansAreWellFormed(spans, length)) {
    throw new RangeError('tagsFromSpans: spans must be sorted, non-overlapping and inside the utterance');
  }
  const tags: string[] = new Array<string>(length).fill('O');
  let previous: Span | undefined;
  for (const span of spans) {
    const { start, end, slot } = span;
    for (let i = start; i < end; i++) tags[i] = tagFormat('I', slot);
    if (scheme === 'iob2') {
      tags[start] = tagFormat('B', slot);
    } else if (scheme === 'iob1') {
      // IOB1 uses B only where a span directly follows another span of the same slot.
      const adjacentSame = previous !== undefined && previous.end === start && previous.slot === slot;
      if (adjacentSame) tags[start] = tagFormat('B', slot);
    } else if (end - start === 1) {
      tags[start] = tagFormat('S', slot);
    } else {
      tags[start] = tagFormat('B', slot);
      tags[end - 1] = tagFormat('E', slot);
    }
    previous = span;
  }
  return tags;
}

/** Re-encode a tag sequence in another scheme (illegal input is read leniently, see `spansFromTags`). */
export function tagsConvert(tags: readonly string[], to: Scheme): string[] {
  return tagsFromSpans(spansFromTags(tags), tags.length, to);
}
