import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { agreementCompute, layersAlign, type AgreementReport } from '../../../src/core/agreement';
import { spansFromTags } from '../../../src/core/schemes';
import type { Scheme, Span, Utterance } from '../../../src/core/types';
import { tagArb } from '../schemes/arbitraries';

/** Tokens w0 w1 … laid one space apart. */
function textOf(length: number): { text: string; tokens: { start: number; end: number }[] } {
  const words = Array.from({ length }, (_, t) => `w${String(t)}`);
  const tokens: { start: number; end: number }[] = [];
  let at = 0;
  for (const word of words) {
    tokens.push({ start: at, end: at + word.length });
    at += word.length + 1;
  }
  return { text: words.join(' '), tokens };
}

function layerOf(name: string, scheme: Scheme, sequences: readonly (readonly string[])[]) {
  const utterances: Utterance[] = sequences.map((tags, u) => ({ id: `hr-${String(u + 1)}`, ...textOf(tags.length), tags: [...tags], meta: {} }));
  return { name, scheme, utterances };
}

function pairReport(a: readonly (readonly string[])[], b: readonly (readonly string[])[], schemeA: Scheme = 'iob2', schemeB: Scheme = 'iob2'): AgreementReport {
  const aligned = layersAlign([layerOf('ann-a', schemeA, a), layerOf('ann-b', schemeB, b)]);
  if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
  return agreementCompute(aligned.corpus, { bootstrap: 0 });
}

describe('span agreement in the CoNLL-2000 reading (hand-worked cases)', () => {
  // CoNLL-2000 shared task evaluation convention (conlleval): a chunk is an exact match only with the
  // same start, end and type; a stray I-X opens a new chunk. F1 = 2·matched / (|A| + |B|) (Hripcsak &
  // Rothschild 2005). The expected numbers below are worked by hand.
  it('a boundary off by one is an exact miss but an overlap hit', () => {
    const report = pairReport([['B-day', 'I-day', 'O']], [['B-day', 'I-day', 'I-day']]);
    expect(report.spans).toMatchObject({ a: 1, b: 1, exactMatched: 0, overlapMatched: 1, exactF1: 0, overlapF1: 1 });
  });

  it('a stray I- after O opens a span, so it matches B- I- exactly', () => {
    const report = pairReport([['O', 'I-area', 'I-area']], [['O', 'B-area', 'I-area']]);
    expect(report.spans).toMatchObject({ a: 1, b: 1, exactMatched: 1, exactF1: 1, overlapF1: 1 });
  });

  it('a stray I- after another slot opens a span of its own slot', () => {
    const report = pairReport([['B-day', 'I-area']], [['B-day', 'B-area']]);
    expect(report.spans).toMatchObject({ a: 2, b: 2, exactMatched: 2, exactF1: 1 });
  });

  it('one span overlapping two is matched once (one-to-one)', () => {
    // A: day [0,1) and day [2,3) (a stray I- after O); B: day [0,3).
    const report = pairReport([['B-day', 'O', 'I-day']], [['B-day', 'I-day', 'I-day']]);
    expect(report.spans).toMatchObject({ a: 2, b: 1, exactMatched: 0, overlapMatched: 1 });
    expect(report.spans.overlapF1).toBeCloseTo(2 / 3, 12);
  });

  it('adjacent same-slot spans against one long span: exact 0, overlap 1 of 3 spans', () => {
    const report = pairReport([['B-area', 'B-area']], [['B-area', 'I-area']]);
    expect(report.spans).toMatchObject({ a: 2, b: 1, exactMatched: 0, overlapMatched: 1, exactF1: 0 });
    expect(report.spans.overlapF1).toBeCloseTo(2 / 3, 12);
  });

  it('overlapping spans of different slots match neither way', () => {
    const report = pairReport([['B-day', 'I-day']], [['B-time_window', 'I-time_window']]);
    expect(report.spans).toMatchObject({ exactMatched: 0, overlapMatched: 0, exactF1: 0, overlapF1: 0 });
    expect(report.perSlot.day).toMatchObject({ a: 1, b: 0, exactMatched: 0, exactF1: 0 });
    expect(report.perSlot.time_window).toMatchObject({ a: 0, b: 1, exactF1: 0 });
  });

  it('layers in different schemes compare as the same spans', () => {
    const report = pairReport([['S-day', 'B-area', 'E-area']], [['B-day', 'B-area', 'I-area']], 'bioes', 'iob2');
    expect(report.spans).toMatchObject({ a: 2, b: 2, exactMatched: 2, exactF1: 1 });
    expect(report.kappa.tag.observed).toBe(1);
  });

  it('per-slot exact F1 counts each slot apart', () => {
    // day: exact 1 of (1 + 1); area: A [2,4), B [2,3): exact 0 of (1 + 1); service only in B.
    const report = pairReport([['B-day', 'O', 'B-area', 'I-area', 'O']], [['B-day', 'O', 'B-area', 'O', 'B-service']]);
    expect(report.perSlot.day).toMatchObject({ a: 1, b: 1, exactMatched: 1, exactF1: 1 });
    expect(report.perSlot.area).toMatchObject({ a: 1, b: 1, exactMatched: 0, exactF1: 0 });
    expect(report.perSlot.service).toMatchObject({ a: 0, b: 1, exactMatched: 0, exactF1: 0 });
    expect(report.spans).toMatchObject({ a: 2, b: 3, exactMatched: 1, overlapMatched: 2 });
  });
});

/** Maximum bipartite matching by augmenting paths (Kuhn's algorithm), the brute-force check. */
function maximumMatching(a: readonly Span[], b: readonly Span[]): number {
  const owner = new Array<number>(b.length).fill(-1);
  const overlaps = (x: Span, y: Span): boolean => x.slot === y.slot && x.start < y.end && y.start < x.end;
  const augment = (i: number, seen: boolean[]): boolean => {
    for (let j = 0; j < b.length; j++) {
      if (seen[j] || !overlaps(a[i] as Span, b[j] as Span)) continue;
      seen[j] = true;
      if (owner[j] === -1 || augment(owner[j] ?? -1, seen)) {
        owner[j] = i;
        return true;
      }
    }
    return false;
  };
  let matched = 0;
  for (let i = 0; i < a.length; i++) if (augment(i, new Array<boolean>(b.length).fill(false))) matched++;
  return matched;
}

describe('span matching properties', () => {
  /** Two tag sequences of one length (the tokens of one utterance, labelled twice). */
  const equalPairArb = (tag: fc.Arbitrary<string>) =>
    fc.integer({ min: 0, max: 14 }).chain((length) => {
      const sequence = fc.array(tag, { minLength: length, maxLength: length });
      return fc.tuple(sequence, sequence);
    });
  // Few slots and long sequences, so spans pile up and one span overlaps several.
  const pairsArb = fc.array(equalPairArb(fc.constantFrom('O', 'B-day', 'I-day', 'B-area', 'I-area')), { minLength: 1, maxLength: 6 });

  it('overlap matches equal a maximum bipartite matching; exact matches are shared spans', () => {
    fc.assert(
      fc.property(pairsArb, (pairs) => {
        const report = pairReport(
          pairs.map(([x]) => x),
          pairs.map(([, y]) => y),
        );
        let overlap = 0;
        let exact = 0;
        for (const [x, y] of pairs) {
          const spansA = spansFromTags(x);
          const spansB = spansFromTags(y);
          overlap += maximumMatching(spansA, spansB);
          const keys = new Set(spansB.map((s) => `${String(s.start)}:${String(s.end)}:${s.slot}`));
          exact += spansA.filter((s) => keys.has(`${String(s.start)}:${String(s.end)}:${s.slot}`)).length;
        }
        expect(report.spans.overlapMatched).toBe(overlap);
        expect(report.spans.exactMatched).toBe(exact);
        expect(report.spans.exactMatched).toBeLessThanOrEqual(report.spans.overlapMatched);
      }),
      { seed: 42, numRuns: 400 },
    );
  });

  it('swapping the layers leaves every span count the same', () => {
    fc.assert(
      fc.property(fc.array(equalPairArb(tagArb), { minLength: 1, maxLength: 5 }), (pairs) => {
        const forward = pairReport(pairs.map(([x]) => x), pairs.map(([, y]) => y));
        const backward = pairReport(pairs.map(([, y]) => y), pairs.map(([x]) => x));
        expect(backward.spans).toEqual({ ...forward.spans, a: forward.spans.b, b: forward.spans.a });
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});
