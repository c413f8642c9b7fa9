import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  findingKey,
  findingLocations,
  identicalFind,
  modelDisagreementsFind,
  slotOutliersFind,
  variationFind,
  type Finding,
  type LabelledUtterance,
  type ModelComparedUtterance,
} from '../../../src/core/error-detect';
import { naiveGrams, naiveSharesNeighbour } from './naive';

// Small vocabulary and tag set so n-grams recur and vary often (invented home-repair words).
const WORDS = ['fix', 'the', 'Sink', 'sink', 'kitchen', 'today', 'tap', 'leak'] as const;
const TAGS = ['O', 'O', 'B-area', 'I-area', 'B-problem', 'I-problem', 'B-day'] as const;
const INTENTS = ['book_visit', 'cancel'] as const;

const utteranceArb = (id: number): fc.Arbitrary<LabelledUtterance> =>
  fc
    .array(fc.tuple(fc.constantFrom(...WORDS), fc.constantFrom(...TAGS)), { maxLength: 7 })
    .chain((pairs) =>
      fc.record({
        id: fc.constant(`hr-${String(id)}`),
        layer: fc.constantFrom('ann-a', 'ann-b'),
        tokens: fc.constant(pairs.map(([w]) => w)),
        tags: fc.constant(pairs.map(([, t]) => t)),
        intent: fc.constantFrom(...INTENTS),
      }),
    );

const corpusArb: fc.Arbitrary<LabelledUtterance[]> = fc
  .integer({ min: 0, max: 30 })
  .chain((count) => fc.tuple(...Array.from({ length: count }, (_, i) => utteranceArb(i + 1))))
  .map((list) => [...list]);

function corpusFindings(corpus: readonly LabelledUtterance[]): Finding[] {
  // Model output made from each utterance's own content, so reordering cannot change it.
  const compared: ModelComparedUtterance[] = corpus.map((u) => ({
    ...u,
    modelTags: [...u.tags].reverse(),
    confidences: u.tokens.map((w, t) => ((w.length + t + u.id.length) % 10) / 10),
  }));
  return [
    ...variationFind(corpus, { maxLength: 4 }),
    ...identicalFind(corpus),
    ...slotOutliersFind(corpus, { minRatio: 2, minMajority: 2 }),
    ...modelDisagreementsFind(compared, { minConfidence: 0.3 }),
  ];
}

/** Token-range sanity of every location, checked against the corpus. */
export function locationsAreInRange(corpus: readonly LabelledUtterance[], findings: readonly Finding[]): boolean {
  const lengths = new Map(corpus.map((u) => [`${u.layer}\u0000${u.id}`, u.tokens.length]));
  return findings.every((finding) =>
    findingLocations(finding).every((l) => {
      const length = lengths.get(`${l.layer}\u0000${l.id}`);
      return length !== undefined && l.start >= 0 && l.start <= l.end && l.end <= length && (l.start < l.end || length === 0);
    }),
  );
}

describe('error-detection properties (fast-check, seed 42)', () => {
  it('findings never reference tokens out of range', () => {
    fc.assert(
      fc.property(corpusArb, (corpus) => locationsAreInRange(corpus, corpusFindings(corpus))),
      { seed: 42, numRuns: 200 },
    );
  });

  it('variation locations sit on the reported words, and the nucleus is where readings differ', () => {
    fc.assert(
      fc.property(corpusArb, (corpus) => {
        const byId = new Map(corpus.map((u) => [u.id, u]));
        for (const finding of variationFind(corpus, { maxLength: 4 })) {
          const { start, end } = finding.nucleus;
          expect(finding.readings.length).toBeGreaterThan(1);
          const columns = finding.readings.map((r) => r.tags.slice(start, end).join(' '));
          expect(new Set(columns).size).toBeGreaterThan(1);
          for (const reading of finding.readings) {
            expect(reading.tags.slice(0, start)).toEqual(finding.readings[0]?.tags.slice(0, start));
            for (const l of reading.locations) {
              const words = byId.get(l.id)?.tokens.slice(l.start - start, l.start - start + finding.tokens.length);
              expect(words?.map((w) => w.toLowerCase())).toEqual(finding.tokens);
            }
          }
        }
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('variation findings match a naive string-keyed reference of the definition', () => {
    const maxLength = 4;
    let reported = 0;
    fc.assert(
      fc.property(corpusArb, (corpus) => {
        const grams = naiveGrams(corpus, maxLength);
        const expected = [...grams]
          .filter(([key, g]) => g.sequences.size > 1 && ((JSON.parse(key) as string[]).length === maxLength || !naiveSharesNeighbour(g)))
          .map(([key, g]) => `${key}#${String(g.count)}`)
          .sort();
        const found = variationFind(corpus, { maxLength })
          .map((f) => `${JSON.stringify(f.tokens)}#${String(f.occurrences)}`)
          .sort();
        expect(found).toEqual(expected);
        reported += found.length;
      }),
      { seed: 42, numRuns: 200 },
    );
    // The small vocabulary makes variation common, so the comparison is not vacuous.
    expect(reported).toBeGreaterThan(200);
  });

  it('a corpus with every occurrence labelled alike yields no variation or identical findings', () => {
    // Each folded word always carries the same legal tag (O or B-x), and the intent follows the text.
    const labellingArb = fc.array(fc.constantFrom('O', 'B-area', 'B-problem', 'B-day'), { minLength: WORDS.length, maxLength: WORDS.length });
    fc.assert(
      fc.property(corpusArb, labellingArb, (corpus, labels) => {
        const tagOf = (word: string): string => labels[WORDS.findIndex((w) => w.toLowerCase() === word.toLowerCase())] ?? 'O';
        const alike = corpus.map((u) => ({ ...u, tags: u.tokens.map(tagOf), intent: u.tokens.length % 2 === 0 ? 'book_visit' : 'cancel' }));
        return variationFind(alike).length === 0 && identicalFind(alike).length === 0;
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('keys and results are stable under reordering of utterances', () => {
    const keysOf = (findings: readonly Finding[]): string[] => findings.map(findingKey).sort();
    fc.assert(
      fc.property(
        corpusArb.chain((corpus) => fc.tuple(fc.constant(corpus), fc.shuffledSubarray(corpus, { minLength: corpus.length, maxLength: corpus.length }))),
        ([corpus, shuffled]) => {
          expect(keysOf(corpusFindings(shuffled))).toEqual(keysOf(corpusFindings(corpus)));
          expect(variationFind(shuffled)).toEqual(variationFind(corpus));
          expect(identicalFind(shuffled)).toEqual(identicalFind(corpus));
          expect(slotOutliersFind(shuffled, { minRatio: 2, minMajority: 2 })).toEqual(slotOutliersFind(corpus, { minRatio: 2, minMajority: 2 }));
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });
});
