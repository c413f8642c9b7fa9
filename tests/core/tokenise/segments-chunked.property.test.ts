import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { wordSegmentsChunked } from '../../../src/core/tokenise/tokenise';

// Pieces chosen to meet the UAX #29 rules that look across characters: letters and digits with
// mid-word punctuation (WB6/7, WB11/12), spaces (WB3d), combining marks, ZWJ and format characters
// (WB4), ZWJ + pictograph (WB3c), regional indicators (WB15/16), Katakana (WB13), Hebrew letters and
// quotes (WB7a-c), a Thai run (dictionary segmentation), newlines (WB3a/b) and tabs.
const PIECES = [
  'a', 'Z', '7', ' ', ' ', '  ', '.', "'", ',', ':', '-', '\t', '\n', '\r\n', '\u0301', '\u200d', '\u00ad',
  '\u2060', '👍', '👍🏽', '\u{1F1EB}', '\u{1F1F7}', 'カ', 'ー', 'א', '"', '\u05F3', 'ไปไหน', '3.5', "don't", 'e-mail',
];
const text = fc.array(fc.constantFrom(...PIECES), { maxLength: 120 }).map((parts) => parts.join(''));

describe('wordSegmentsChunked', () => {
  it('gives the same segments as one pass, whatever the piece size', () => {
    // Reference: the engine's own segmenter over the whole text in one pass (Intl.Segmenter, UAX #29).
    fc.assert(
      fc.property(text, fc.integer({ min: 1, max: 40 }), (t, chunk) => {
        expect(wordSegmentsChunked(t, chunk)).toEqual(wordSegmentsChunked(t, Number.MAX_SAFE_INTEGER));
      }),
      { seed: 42, numRuns: 3000 },
    );
  });

  it('cuts only before an ASCII letter or digit that follows a space', () => {
    const t = 'book a plumber for tuesday 9am, flat 4b';
    const whole = wordSegmentsChunked(t, Number.MAX_SAFE_INTEGER);
    expect(wordSegmentsChunked(t, 3)).toEqual(whole);
    expect(whole.map((s) => t.slice(s.start, s.end)).join('')).toBe(t);
  });
});
