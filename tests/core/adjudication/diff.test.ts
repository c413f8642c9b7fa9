import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { adjudicationDiff, intentsDiffer } from '../../../src/core/adjudication';
import { spansFromTags } from '../../../src/core/schemes';
import type { Span } from '../../../src/core/types';
import { layerPair } from './arbitraries';

const key = (s: Span) => `${s.start}:${s.end}:${s.slot}`;

describe('adjudicationDiff', () => {
  it('finds the disputed token ranges of two layers, one region per overlapping group', () => {
    // "book a plumber for friday morning": A has day=friday, time_window=morning; B has day="friday morning".
    const a = ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window'];
    const b = ['O', 'O', 'B-service', 'O', 'B-day', 'I-day'];
    const diff = adjudicationDiff(a, b);
    expect(diff.agreed).toEqual([{ start: 2, end: 3, slot: 'service' }]);
    expect(diff.regions).toEqual([
      {
        start: 4,
        end: 6,
        a: [
          { start: 4, end: 5, slot: 'day' },
          { start: 5, end: 6, slot: 'time_window' },
        ],
        b: [{ start: 4, end: 6, slot: 'day' }],
      },
    ]);
  });

  it('reads a stray I-X like B-X (CoNLL-2000 reading), so it is no disagreement; a missed span is one', () => {
    expect(adjudicationDiff(['O', 'I-area', 'O'], ['O', 'B-area', 'O']).regions).toEqual([]);
    expect(adjudicationDiff(['B-area', 'O', 'B-day'], ['O', 'O', 'B-day']).regions).toEqual([{ start: 0, end: 1, a: [{ start: 0, end: 1, slot: 'area' }], b: [] }]);
  });

  it('keeps touching but not overlapping disagreements apart', () => {
    const diff = adjudicationDiff(['B-day', 'B-area'], ['B-area', 'B-day']);
    expect(diff.regions.map((r) => [r.start, r.end])).toEqual([
      [0, 1],
      [1, 2],
    ]);
  });

  it('property: every span of either layer is agreed or inside exactly one region; regions are sorted and disjoint', () => {
    fc.assert(
      fc.property(layerPair, ([a, b]) => {
        const diff = adjudicationDiff(a, b);
        const agreed = new Set(diff.agreed.map(key));
        for (const [side, tags] of [['a', a], ['b', b]] as const) {
          for (const span of spansFromTags(tags)) {
            const holders = diff.regions.filter((r) => r[side].some((s) => key(s) === key(span)));
            expect(holders.length + (agreed.has(key(span)) ? 1 : 0)).toBe(1);
          }
        }
        for (const [i, region] of diff.regions.entries()) {
          expect(region.a.length + region.b.length).toBeGreaterThan(0);
          for (const s of [...region.a, ...region.b]) expect(s.start >= region.start && s.end <= region.end).toBe(true);
          const next = diff.regions[i + 1];
          if (next !== undefined) expect(region.end).toBeLessThanOrEqual(next.start);
          for (const s of diff.agreed) expect(s.end <= region.start || s.start >= region.end).toBe(true);
        }
        // Same spans in both layers: nothing to resolve.
        expect(diff.regions.length === 0).toBe(spansFromTags(a).map(key).join() === spansFromTags(b).map(key).join());
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});

describe('intentsDiffer', () => {
  it('treats a missing intent as differing from a named one, and two missing ones as agreeing', () => {
    expect(intentsDiffer('book_visit', 'reschedule')).toBe(true);
    expect(intentsDiffer('book_visit', null)).toBe(true);
    expect(intentsDiffer(null, '')).toBe(false);
    expect(intentsDiffer('cancel', 'cancel')).toBe(false);
  });
});
