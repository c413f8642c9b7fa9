import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { rangeNormalise, spanAt, spanLabel, spanRemove, spansRemoveIn, tagsLegalise } from '../../../src/core/editing';
import { transitionsValidate } from '../../../src/core/rules';
import { spansAreWellFormed, spansFromTags } from '../../../src/core/schemes';
import { SLOTS, tagSequenceArb } from '../schemes/arbitraries';

// Sequences with tags of every scheme and malformed ones, plus an inclusive range inside them.
const withRangeArb = tagSequenceArb
  .filter((tags) => tags.length > 0)
  .chain((tags) => fc.tuple(fc.constant(tags), fc.nat(tags.length - 1), fc.nat(tags.length - 1), fc.constantFrom(...SLOTS)));

const legal = (tags: string[]) => transitionsValidate(tags, 'iob2');

describe('spanLabel', () => {
  it('labels a range as B then I, in either order of its ends', () => {
    const tags = ['O', 'O', 'O', 'O'];
    expect(spanLabel(tags, 1, 2, 'day')).toEqual(['O', 'B-day', 'I-day', 'O']);
    expect(spanLabel(tags, 2, 1, 'day')).toEqual(['O', 'B-day', 'I-day', 'O']);
    expect(tags).toEqual(['O', 'O', 'O', 'O']);
  });

  it('removes partly overlapped spans entirely (no trimmed fragments)', () => {
    // "plumber Friday morning please": day covers Friday morning; relabelling "morning" drops "Friday" too.
    const tags = ['B-service', 'B-day', 'I-day', 'O'];
    expect(spanLabel(tags, 2, 2, 'time_window')).toEqual(['B-service', 'O', 'B-time_window', 'O']);
    expect(spanLabel(tags, 0, 1, 'area')).toEqual(['B-area', 'I-area', 'O', 'O']);
  });

  it('keeps an adjacent span of the same slot apart (B starts the new one)', () => {
    expect(spanLabel(['B-day', 'O', 'O'], 1, 2, 'day')).toEqual(['B-day', 'B-day', 'I-day']);
  });

  it('reads illegal stored tags the CoNLL-2000 way before editing: a stray I- is a span of its own', () => {
    // I-day after O opens a span (CoNLL-2000 conlleval reading, as spansFromTags documents).
    const stored = ['O', 'I-day', 'I-day', 'O', 'E-area'];
    expect(spanLabel(stored, 3, 3, 'service')).toEqual(['O', 'B-day', 'I-day', 'B-service', 'B-area']);
    // A malformed tag reads as O, so the I-day after it opens a span of its own.
    expect(spanLabel(['b-day', 'I-day'], 0, 0, 'area')).toEqual(['B-area', 'B-day']);
  });

  it('returns no tags for an empty utterance and clamps out-of-range indices', () => {
    expect(spanLabel([], 0, 3, 'day')).toEqual([]);
    expect(spanLabel(['O', 'O'], -3, 9, 'day')).toEqual(['B-day', 'I-day']);
    expect(rangeNormalise(4, 1, 3)).toEqual({ from: 1, to: 2 });
  });

  it('property: the result is legal IOB2 with zero violations, and the range is one span of the slot', () => {
    fc.assert(
      fc.property(withRangeArb, ([tags, a, b, slot]) => {
        const out = spanLabel(tags, a, b, slot);
        expect(out).toHaveLength(tags.length);
        expect(legal(out)).toEqual([]);
        const from = Math.min(a, b);
        const to = Math.max(a, b);
        const spans = spansFromTags(out);
        expect(spans).toContainEqual({ start: from, end: to + 1, slot });
        expect(spansAreWellFormed(spans, out.length)).toBe(true);
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('property: spans that did not touch the range are kept unchanged', () => {
    fc.assert(
      fc.property(withRangeArb, ([tags, a, b, slot]) => {
        const from = Math.min(a, b);
        const to = Math.max(a, b);
        const untouched = spansFromTags(tags).filter((s) => s.end <= from || s.start > to);
        const after = spansFromTags(spanLabel(tags, a, b, slot));
        for (const span of untouched) expect(after).toContainEqual(span);
        expect(after).toHaveLength(untouched.length + 1);
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});

describe('spanRemove, spansRemoveIn, spanAt', () => {
  it('removes the whole span under a token, nothing when the token is outside', () => {
    const tags = ['B-service', 'O', 'B-day', 'I-day'];
    expect(spanRemove(tags, 3)).toEqual(['B-service', 'O', 'O', 'O']);
    expect(spanRemove(tags, 1)).toEqual(tags);
    expect(spanAt(tags, 2)).toEqual({ start: 2, end: 4, slot: 'day' });
    expect(spanAt(tags, 1)).toBeNull();
  });

  it('Delete on a selection removes every span it touches', () => {
    expect(spansRemoveIn(['B-area', 'I-area', 'B-day', 'O', 'B-budget'], 1, 2)).toEqual(['O', 'O', 'O', 'O', 'B-budget']);
  });

  it('property: label then remove leaves every token of the range O, and the result is legal', () => {
    fc.assert(
      fc.property(withRangeArb, ([tags, a, b, slot]) => {
        const labelled = spanLabel(tags, a, b, slot);
        const removed = spanRemove(labelled, a);
        expect(legal(removed)).toEqual([]);
        for (let i = Math.min(a, b); i <= Math.max(a, b); i++) expect(removed[i]).toBe('O');
        const viaRange = spansRemoveIn(labelled, b, a);
        for (let i = Math.min(a, b); i <= Math.max(a, b); i++) expect(viaRange[i]).toBe('O');
        expect(legal(viaRange)).toEqual([]);
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('property: removing keeps IOB2 legal and never creates spans; spanAt agrees with the decoded spans', () => {
    fc.assert(
      fc.property(withRangeArb, ([tags, a]) => {
        const out = spanRemove(tags, a);
        expect(legal(out)).toEqual([]);
        expect(spanAt(out, a)).toBeNull();
        expect(spansFromTags(out).length).toBeLessThanOrEqual(spansFromTags(tags).length);
        const covering = spansFromTags(tags).filter((s) => s.start <= a && a < s.end);
        expect(covering.length).toBeLessThanOrEqual(1);
        expect(spanAt(tags, a)).toEqual(covering[0] ?? null);
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('tagsLegalise is the identity on legal IOB2 and legal afterwards on anything', () => {
    fc.assert(
      fc.property(tagSequenceArb, (tags) => {
        const out = tagsLegalise(tags);
        expect(legal(out)).toEqual([]);
        expect(tagsLegalise(out)).toEqual(out);
        if (legal(tags).length === 0 && tags.every((t) => t === 'O' || /^[BI]-/.test(t))) expect(out).toEqual(tags);
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});

describe('sequences of edits', () => {
  const opArb = fc.tuple(fc.boolean(), fc.nat(20), fc.nat(20), fc.constantFrom(...SLOTS));

  it('property: any run of label and remove operations keeps spans sorted, disjoint and legal', () => {
    fc.assert(
      fc.property(tagSequenceArb.filter((t) => t.length > 0), fc.array(opArb, { maxLength: 12 }), (start, ops) => {
        let tags = start;
        for (const [isLabel, a, b, slot] of ops) {
          const i = a % tags.length;
          const j = b % tags.length;
          tags = isLabel ? spanLabel(tags, i, j, slot) : spanRemove(tags, i);
          expect(legal(tags)).toEqual([]);
          expect(spansAreWellFormed(spansFromTags(tags), tags.length)).toBe(true);
        }
      }),
      { seed: 42, numRuns: 300 },
    );
  });
});
