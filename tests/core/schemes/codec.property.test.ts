import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { transitionsValidate } from '../../../src/core/rules';
import { spansFromTags, tagsConvert, tagsFromSpans } from '../../../src/core/schemes';
import { SCHEMES } from '../../../src/core/types';
import { spansArb, tagSequenceArb } from './arbitraries';

describe('tag codec properties', () => {
  it('decode(encode(spans)) gives the spans back, and every encoding validates clean', () => {
    fc.assert(
      fc.property(spansArb, ({ length, spans }) => {
        for (const scheme of SCHEMES) {
          const tags = tagsFromSpans(spans, length, scheme);
          expect(tags).toHaveLength(length);
          expect(spansFromTags(tags)).toEqual(spans);
          expect(transitionsValidate(tags, scheme)).toEqual([]);
        }
      }),
      { seed: 42, numRuns: 2000 },
    );
  });

  it('converting between schemes preserves spans and equals the direct encoding', () => {
    fc.assert(
      fc.property(spansArb, fc.constantFrom(...SCHEMES), fc.constantFrom(...SCHEMES), ({ length, spans }, from, to) => {
        const converted = tagsConvert(tagsFromSpans(spans, length, from), to);
        expect(converted).toEqual(tagsFromSpans(spans, length, to));
        expect(spansFromTags(converted)).toEqual(spans);
      }),
      { seed: 42, numRuns: 2000 },
    );
  });

  it('converting any sequence, legal or not, keeps its lenient reading and yields a legal sequence', () => {
    fc.assert(
      fc.property(tagSequenceArb, fc.constantFrom(...SCHEMES), (tags, to) => {
        const converted = tagsConvert(tags, to);
        expect(spansFromTags(converted)).toEqual(spansFromTags(tags));
        expect(transitionsValidate(converted, to)).toEqual([]);
      }),
      { seed: 42, numRuns: 2000 },
    );
  });
});
