import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { adjudicationDiff, draftStart, goldTags, spansCut, spansPlace, spansTake, type Side } from '../../../src/core/adjudication';
import { transitionsValidate } from '../../../src/core/rules';
import { spansFromTags, tagsConvert } from '../../../src/core/schemes';
import { SCHEMES, type Span } from '../../../src/core/types';
import { isLegalIob2, layerPair } from './arbitraries';

type Step = { kind: 'take'; region: number; side: Side } | { kind: 'place'; start: number; width: number; slot: string | null };

const step: fc.Arbitrary<Step> = fc.oneof(
  fc.record({ kind: fc.constant('take' as const), region: fc.nat(6), side: fc.constantFrom<Side>('a', 'b') }),
  fc.record({ kind: fc.constant('place' as const), start: fc.nat(14), width: fc.integer({ min: 0, max: 4 }), slot: fc.constantFrom('day', 'budget', null) }),
);

function run(a: string[], b: string[], steps: readonly Step[]): Span[] {
  const diff = adjudicationDiff(a, b);
  let spans = draftStart(diff);
  for (const s of steps) {
    if (s.kind === 'take') {
      const region = diff.regions[s.region % Math.max(1, diff.regions.length)];
      if (region !== undefined) spans = spansTake(spans, region, s.side);
    } else {
      const start = Math.min(s.start, a.length);
      spans = spansPlace(spans, start, Math.min(a.length, start + s.width), s.slot);
    }
  }
  return spans;
}

describe('building gold from two layers', () => {
  it('property: the gold tags are always legal IOB2, whatever was taken or edited', () => {
    fc.assert(
      fc.property(layerPair, fc.array(step, { maxLength: 8 }), ([a, b], steps) => {
        const tags = goldTags(run(a, b, steps), a.length, 'iob2');
        expect(tags).toHaveLength(a.length);
        expect(isLegalIob2(tags)).toBe(true);
        expect(transitionsValidate(tags, 'iob2')).toEqual([]);
      }),
      { seed: 42, numRuns: 1000 },
    );
  });

  it('property: in every scheme the gold tags validate clean', () => {
    fc.assert(
      fc.property(layerPair, fc.array(step, { maxLength: 6 }), fc.constantFrom(...SCHEMES), ([a, b], steps, scheme) => {
        expect(transitionsValidate(goldTags(run(a, b, steps), a.length, scheme), scheme)).toEqual([]);
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it("property: taking A everywhere gives A's spans exactly (and B's for B)", () => {
    fc.assert(
      fc.property(layerPair, ([a, b]) => {
        const diff = adjudicationDiff(a, b);
        for (const side of ['a', 'b'] as const) {
          const spans = diff.regions.reduce((acc, r) => spansTake(acc, r, side), draftStart(diff));
          const source = side === 'a' ? a : b;
          const tags = goldTags(spans, a.length, 'iob2');
          expect(spansFromTags(tags)).toEqual(spansFromTags(source));
          // The same as re-encoding the layer read the CoNLL-2000 way.
          expect(tags).toEqual(tagsConvert(source, 'iob2'));
        }
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('property: choosing per region keeps each choice and the agreed spans, in any order of decisions', () => {
    fc.assert(
      fc.property(layerPair, fc.array(fc.constantFrom<Side>('a', 'b'), { minLength: 8, maxLength: 8 }), ([a, b], choices) => {
        const diff = adjudicationDiff(a, b);
        const order = diff.regions.map((_, i) => i).reverse();
        const spans = order.reduce((acc, i) => spansTake(acc, diff.regions[i] as (typeof diff.regions)[number], choices[i % 8] as Side), draftStart(diff));
        const want = [...diff.agreed, ...diff.regions.flatMap((r, i) => r[choices[i % 8] as Side])].sort((x, y) => x.start - y.start);
        expect(spansFromTags(goldTags(spans, a.length, 'iob2'))).toEqual(want);
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('trims spans around a cut and a placed label, leaving the parts outside', () => {
    const spans: Span[] = [{ start: 0, end: 5, slot: 'problem' }];
    expect(spansCut(spans, 2, 3)).toEqual([
      { start: 0, end: 2, slot: 'problem' },
      { start: 3, end: 5, slot: 'problem' },
    ]);
    expect(spansPlace(spans, 4, 6, 'day')).toEqual([
      { start: 0, end: 4, slot: 'problem' },
      { start: 4, end: 6, slot: 'day' },
    ]);
    expect(goldTags(spansPlace(spans, 1, 3, null), 6, 'iob2')).toEqual(['B-problem', 'O', 'O', 'B-problem', 'I-problem', 'O']);
  });
});
