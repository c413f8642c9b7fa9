import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { schemeDetect, tagsFromSpans } from '../../../src/core/schemes';
import { SCHEMES } from '../../../src/core/types';
import { spansArb } from './arbitraries';

describe('schemeDetect', () => {
  it.each([
    ['no sequences', [], 'iob2'],
    ['only O', [['O', 'O']], 'iob2'],
    ['an E- tag', [['B-day', 'E-day']], 'bioes'],
    ['an S- tag, even beside IOB2 evidence', [['O', 'B-area', 'I-area'], ['S-day']], 'bioes'],
    ['B- after O', [['O', 'B-day', 'I-day']], 'iob2'],
    ['B- at the utterance start', [['B-day', 'I-day']], 'iob2'],
    ['I- opening spans, B- only between same-slot neighbours', [['I-day', 'I-day', 'B-day'], ['O', 'I-area']], 'iob1'],
    ['I- opening spans, no B- at all', [['O', 'I-service', 'I-day']], 'iob1'],
    ['I- opening, but B- after another slot', [['I-day', 'B-area']], 'iob2'],
    ['B- after O in one utterance outweighs I- openings in another', [['I-day'], ['O', 'B-area']], 'iob2'],
    ['malformed tags ignored', [['b-day', 'I-day']], 'iob1'],
  ] as const)('%s -> %s', (_name, sequences, expected) => {
    expect(schemeDetect(sequences)).toBe(expected);
  });

  it('reads any iterable once, e.g. a generator', () => {
    function* sequences() {
      yield ['O', 'I-day'];
      yield ['I-area', 'B-area'];
    }
    expect(schemeDetect(sequences())).toBe('iob1');
  });

  it('recognises the scheme of any non-empty encoding', () => {
    fc.assert(
      fc.property(spansArb, fc.constantFrom(...SCHEMES), ({ length, spans }, scheme) => {
        fc.pre(spans.length > 0);
        expect(schemeDetect([tagsFromSpans(spans, length, scheme)])).toBe(scheme);
      }),
      { seed: 42, numRuns: 1000 },
    );
  });
});
