import { describe, expect, it } from 'vitest';
import { transitionsValidate } from '../../../src/core/rules';
import { schemeDetect, spansFromTags, tagsConvert, tagsFromSpans } from '../../../src/core/schemes';
import { SCHEMES, type Scheme, type Span } from '../../../src/core/types';

/*
 * Outside reference: Tjong Kim Sang & Veenstra (1999), "Representing Text Chunks", EACL. The rules
 * below are restated from memory of the paper's definitions; the sentences are invented
 * (home-repair requests) and every tag column was derived by hand from those rules, not copied.
 *
 * - IOB1 (paper): I marks a token inside a chunk, O a token outside; B marks the first token of a
 *   chunk that immediately follows another chunk. The paper chunks one type (base NPs); with several
 *   types, "another chunk" is one of the same type, as in the CoNLL-2000 IOB1 data (from memory).
 * - IOB2 (paper): B marks the first token of every chunk, I the other chunk tokens.
 * - BIOES is not one of the paper's representations by that name. We check it as the paper's IOB2
 *   rule (every chunk-initial token marked) combined with its IOE2 rule (every chunk-final token
 *   marked E); a one-token chunk, both initial and final, is S (that letter: common practice, no source).
 */
interface WorkedExample {
  name: string;
  tokens: string[];
  spans: Span[];
  tags: Record<Scheme, string[]>;
}

const EXAMPLES: WorkedExample[] = [
  {
    // Two problem chunks touch: IOB1 needs B on the second one (same type, immediately following).
    name: 'adjacent chunks of one slot',
    tokens: ['please', 'fix', 'a', 'leaking', 'tap', 'blocked', 'drain', 'in', 'Northgate', 'on', 'Friday'],
    spans: [
      { start: 3, end: 5, slot: 'problem' },
      { start: 5, end: 7, slot: 'problem' },
      { start: 8, end: 9, slot: 'area' },
      { start: 10, end: 11, slot: 'day' },
    ],
    tags: {
      iob1: ['O', 'O', 'O', 'I-problem', 'I-problem', 'B-problem', 'I-problem', 'O', 'I-area', 'O', 'I-day'],
      iob2: ['O', 'O', 'O', 'B-problem', 'I-problem', 'B-problem', 'I-problem', 'O', 'B-area', 'O', 'B-day'],
      bioes: ['O', 'O', 'O', 'B-problem', 'E-problem', 'B-problem', 'E-problem', 'O', 'S-area', 'O', 'S-day'],
    },
  },
  {
    // Chunks of different slots touch: the type changes, so IOB1 needs no B anywhere.
    name: 'adjacent chunks of different slots',
    tokens: ['book', 'an', 'electrician', 'Tuesday', 'morning'],
    spans: [
      { start: 2, end: 3, slot: 'service' },
      { start: 3, end: 4, slot: 'day' },
      { start: 4, end: 5, slot: 'time_window' },
    ],
    tags: {
      iob1: ['O', 'O', 'I-service', 'I-day', 'I-time_window'],
      iob2: ['O', 'O', 'B-service', 'B-day', 'B-time_window'],
      bioes: ['O', 'O', 'S-service', 'S-day', 'S-time_window'],
    },
  },
  {
    // Three one-token day chunks in a row: every chunk after the first follows one of its type.
    name: 'a run of one-token chunks of one slot',
    tokens: ['any', 'of', 'Monday', 'Wednesday', 'Thursday', 'works'],
    spans: [
      { start: 2, end: 3, slot: 'day' },
      { start: 3, end: 4, slot: 'day' },
      { start: 4, end: 5, slot: 'day' },
    ],
    tags: {
      iob1: ['O', 'O', 'I-day', 'B-day', 'B-day', 'O'],
      iob2: ['O', 'O', 'B-day', 'B-day', 'B-day', 'O'],
      bioes: ['O', 'O', 'S-day', 'S-day', 'S-day', 'O'],
    },
  },
  {
    // A long chunk opening the utterance, then one closing it: first and last tokens, inner tokens.
    name: 'chunks at both utterance edges',
    tokens: ['under', 'two', 'hundred', 'pounds', 'for', 'gutter', 'cleaning'],
    spans: [
      { start: 0, end: 4, slot: 'budget' },
      { start: 5, end: 7, slot: 'service' },
    ],
    tags: {
      iob1: ['I-budget', 'I-budget', 'I-budget', 'I-budget', 'O', 'I-service', 'I-service'],
      iob2: ['B-budget', 'I-budget', 'I-budget', 'I-budget', 'O', 'B-service', 'I-service'],
      bioes: ['B-budget', 'I-budget', 'I-budget', 'E-budget', 'O', 'B-service', 'E-service'],
    },
  },
];

describe('chunk representations after Tjong Kim Sang & Veenstra (1999)', () => {
  for (const example of EXAMPLES) {
    describe(example.name, () => {
      it('the hand-derived columns fit the tokens', () => {
        for (const scheme of SCHEMES) expect(example.tags[scheme]).toHaveLength(example.tokens.length);
      });

      it.each(SCHEMES)('encodes the chunks as the %s rule says, and decodes them back', (scheme) => {
        expect(tagsFromSpans(example.spans, example.tokens.length, scheme)).toEqual(example.tags[scheme]);
        expect(spansFromTags(example.tags[scheme])).toEqual(example.spans);
        expect(transitionsValidate(example.tags[scheme], scheme)).toEqual([]);
        expect(schemeDetect([example.tags[scheme]])).toBe(scheme);
      });

      for (const from of SCHEMES) {
        it.each(SCHEMES)(`converts ${from} to %s`, (to) => {
          expect(tagsConvert(example.tags[from], to)).toEqual(example.tags[to]);
        });
      }
    });
  }

  it('the IOB1 columns are illegal as IOB2 exactly where a chunk opens with I (paper: IOB2 marks every chunk start)', () => {
    const { tags, spans } = EXAMPLES[0] as WorkedExample;
    const flagged = transitionsValidate(tags.iob1, 'iob2').map((v) => v.index);
    const opensWithI = spans.filter((s) => tags.iob1[s.start]?.startsWith('I-')).map((s) => s.start);
    expect(flagged).toEqual(opensWithI);
    expect(flagged).toEqual([3, 8, 10]);
  });
});
