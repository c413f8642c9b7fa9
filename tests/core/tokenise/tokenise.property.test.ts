import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { offsetSplitsSurrogatePair, tokenise, tokeniseWhitespace, tokeniseWords, wordSegments } from '../../../src/core/tokenise';
import type { TokeniserSpec } from '../../../src/core/tokenise';
import type { Token } from '../../../src/core/types';
import { textArbitrary, visibleTextArbitrary } from './textArbitrary';

const RUNS = { seed: 42, numRuns: 400 };
const WHITE_SPACE = /\p{White_Space}/gu;
const WHITE_SPACE_ONLY = /^\p{White_Space}*$/u;
const BLANK_ONLY = /^[\p{White_Space}\p{Default_Ignorable_Code_Point}]*$/u;

const specs: TokeniserSpec[] = [
  { kind: 'words' },
  { kind: 'whitespace' },
  { kind: 'regex', pattern: '\\p{L}+' },
  { kind: 'regex', pattern: '\\S+\\s*' },
  // Can match the empty string everywhere: must still terminate and yield no empty token.
  { kind: 'regex', pattern: '\\p{L}*' },
  { kind: 'regex', pattern: '(?=\\p{L})' },
  { kind: 'regex', pattern: '.', flags: 's' },
];

function tokensAreWellFormed(tokens: readonly Token[], length: number): boolean {
  let previousEnd = 0;
  for (const { start, end } of tokens) {
    if (!(Number.isInteger(start) && Number.isInteger(end) && start >= previousEnd && end > start && end <= length)) return false;
    previousEnd = end;
  }
  return true;
}

/** The text outside the tokens, in order. */
function gaps(text: string, tokens: readonly Token[]): string[] {
  const out: string[] = [];
  let at = 0;
  for (const { start, end } of tokens) {
    out.push(text.slice(at, start));
    at = end;
  }
  out.push(text.slice(at));
  return out;
}

function graphemeBoundaries(text: string): Set<number> {
  const boundaries = new Set<number>([text.length]);
  for (const { index } of new Intl.Segmenter('und', { granularity: 'grapheme' }).segment(text)) boundaries.add(index);
  return boundaries;
}

describe.each(specs)('every tokeniser: $kind $pattern', (spec) => {
  it('gives sorted, non-overlapping, non-empty tokens inside the text', () => {
    fc.assert(fc.property(textArbitrary, (text) => tokensAreWellFormed(tokenise(text, spec), text.length)), RUNS);
  });

  it('never gives a token of only whitespace or invisible characters, nor whitespace at its edges', () => {
    fc.assert(
      fc.property(textArbitrary, (text) =>
        tokenise(text, spec).every(({ start, end }) => {
          const piece = text.slice(start, end);
          return !WHITE_SPACE_ONLY.test(piece) && !BLANK_ONLY.test(piece) && piece.trim() !== '' && !/^\p{White_Space}(?!\p{M})|\p{White_Space}$/u.test(piece);
        }),
      ),
      RUNS,
    );
  });

  it('never cuts a surrogate pair', () => {
    fc.assert(
      fc.property(textArbitrary, (text) =>
        tokenise(text, spec).every(({ start, end }) => !offsetSplitsSurrogatePair(text, start) && !offsetSplitsSurrogatePair(text, end)),
      ),
      RUNS,
    );
  });
});

describe('whitespace tokeniser', () => {
  it('concatenates to the text with whitespace removed', () => {
    fc.assert(
      fc.property(visibleTextArbitrary, (text) => {
        const tokens = tokeniseWhitespace(text);
        expect(tokens.map(({ start, end }) => text.slice(start, end)).join('')).toBe(text.replace(WHITE_SPACE, ''));
      }),
      RUNS,
    );
  });

  it('cuts at every whitespace and nowhere else, dropping only runs of invisible characters', () => {
    fc.assert(
      fc.property(textArbitrary, (text) => {
        const pieces = tokeniseWhitespace(text).map(({ start, end }) => text.slice(start, end));
        const expected = text.split(/\p{White_Space}+/u).filter((piece) => !BLANK_ONLY.test(piece));
        expect(pieces).toEqual(expected);
      }),
      RUNS,
    );
  });
});

describe('words tokeniser', () => {
  it('reassembles the text from its tokens plus dropped whitespace', () => {
    fc.assert(
      fc.property(visibleTextArbitrary, (text) => {
        const tokens = tokeniseWords(text);
        const dropped = gaps(text, tokens);
        expect(dropped.every((gap) => WHITE_SPACE_ONLY.test(gap))).toBe(true);
        let rebuilt = dropped[0] ?? '';
        tokens.forEach(({ start, end }, i) => {
          rebuilt += text.slice(start, end) + (dropped[i + 1] ?? '');
        });
        expect(rebuilt).toBe(text);
      }),
      RUNS,
    );
  });

  it('drops only whitespace and invisible characters when those stand alone', () => {
    fc.assert(
      fc.property(textArbitrary, (text) => gaps(text, tokeniseWords(text)).every((gap) => BLANK_ONLY.test(gap))),
      RUNS,
    );
  });

  it('keeps one token per visible UAX #29 segment, inside it, on grapheme boundaries', () => {
    fc.assert(
      fc.property(textArbitrary, (text) => {
        const segments = wordSegments(text).filter(({ start, end }) => !BLANK_ONLY.test(text.slice(start, end)));
        const tokens = tokeniseWords(text);
        const boundaries = graphemeBoundaries(text);
        expect(tokens).toHaveLength(segments.length);
        tokens.forEach((token, i) => {
          const segment = segments[i];
          expect(segment).toBeDefined();
          if (segment === undefined) return;
          expect(token.start).toBeGreaterThanOrEqual(segment.start);
          expect(token.end).toBeLessThanOrEqual(segment.end);
          expect(boundaries.has(token.start) && boundaries.has(token.end)).toBe(true);
        });
      }),
      RUNS,
    );
  });
});

describe('regex tokeniser', () => {
  it('takes maximal runs of letters for \\p{L}+', () => {
    fc.assert(
      fc.property(visibleTextArbitrary, (text) => {
        const tokens = tokenise(text, { kind: 'regex', pattern: '\\p{L}+' });
        const pieces = tokens.map(({ start, end }) => text.slice(start, end));
        expect(pieces.every((piece) => /^\p{L}+$/u.test(piece))).toBe(true);
        expect(pieces.join('')).toBe(text.replace(/\P{L}/gu, ''));
        for (const { start, end } of tokens) {
          expect(/\p{L}$/u.test(text.slice(0, start))).toBe(false);
          expect(/^\p{L}/u.test(text.slice(end))).toBe(false);
        }
      }),
      RUNS,
    );
  });
});
