import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { codePointIsNumeric, TOKEN_STOPS, textStopCuts, tokeniseWords, wordSegments } from '../../../src/core/tokenise';
import type { Token } from '../../../src/core/types';

const words = (text: string) => tokeniseWords(text).map((t) => text.slice(t.start, t.end));

// Expected tokens worked out by hand from UAX #29 plus our stop rule (stops.ts): a full stop or colon
// is a token of its own unless a digit stands before it, where WB11/WB12 keep numbers whole.
describe('the stop rule', () => {
  it('splits letters at a colon or full stop, as Chromium does and UAX #29 (WB6/WB7) would not', () => {
    expect(words('javascript:alert(1)')).toEqual(['javascript', ':', 'alert', '(', '1', ')']);
    expect(words('see fixit.example for e.g. taps')).toEqual(['see', 'fixit', '.', 'example', 'for', 'e', '.', 'g', '.', 'taps']);
    expect(words('ANSWER:YES')).toEqual(['ANSWER', ':', 'YES']);
    expect(words('אבג:דה')).toEqual(['אבג', ':', 'דה']);
  });

  it('keeps numbers whole: decimals, times after a digit and digits of other scripts', () => {
    // WB11/WB12 join digits across a full stop; a colon is MidLetter, so 9:30 breaks in every engine anyway.
    expect(words('budget $49.99, 1.5 hours, from 9:30')).toEqual(['budget', '$', '49.99', ',', '1.5', 'hours', ',', 'from', '9', ':', '30']);
    expect(words('\u0661.\u0662 \uFF11\uFF0E\uFF12')).toEqual(['\u0661.\u0662', '\uFF11\uFF0E\uFF12']);
    expect(words('flat 4b.2')).toEqual(['flat', '4b', '.', '2']);
    expect(words('a1.2')).toEqual(['a1.2']);
  });

  it('covers the small and fullwidth forms and keeps marks with the stop they follow (WB4)', () => {
    expect(words('a\uFE55b c\uFF0Ed e\uFF1Af')).toEqual(['a', '\uFE55', 'b', 'c', '\uFF0E', 'd', 'e', '\uFF1A', 'f']);
    expect(words('a:\u0301b')).toEqual(['a', ':\u0301', 'b']);
    // A digit before the stop counts past the marks attached to it.
    expect(words('1\u0301.2')).toEqual(['1\u0301.2']);
  });

  it('cuts only at the five stops, and never after a Numeric character', () => {
    expect([...TOKEN_STOPS].map((c) => c.toString(16))).toEqual(['2e', '3a', 'fe55', 'ff0e', 'ff1a']);
    expect(textStopCuts('no stops here')).toEqual([]);
    expect(textStopCuts('a.b1.2 :x')).toEqual([1, 7]);
    // A joiner after the stop stays with it and still joins the pictograph after it (WB4, WB3c).
    expect(words('a.\u200D👍')).toEqual(['a', '.\u200D👍']);
    expect(codePointIsNumeric('7') && codePointIsNumeric('\u066B') && !codePointIsNumeric('\u066C') && !codePointIsNumeric('a')).toBe(true);
  });
});

// Pieces that meet the rules looking across characters (WB4, WB6/7, WB11/12, WB13, WB15/16, WB3c),
// without dictionary scripts (Thai, CJK), whose segments depend on the whole run.
const PIECES = ['a', 'Z', '7', ' ', '.', ':', "'", ',', '\uFF0E', '\uFF1A', '\uFE55', '\u0301', '\u200d', '\u00ad', '\u2060', '👍', '👍🏽', '\u{1F1EB}', 'カ', 'א', '"', '3.5', '\u0663', '\u066B'];
const text = fc.array(fc.constantFrom(...PIECES), { maxLength: 60 }).map((parts) => parts.join(''));

const boundaries = (segments: readonly Token[]) => new Set(segments.map((s) => s.end));

describe('the stop rule on generated texts', () => {
  it('only adds breaks, and only before a stop that follows no digit or after the marks attached to it', () => {
    const segmenter = new Intl.Segmenter('und', { granularity: 'word' });
    const attached = /^[\p{M}\p{Cf}\p{Emoji_Modifier}]$/u;
    fc.assert(
      fc.property(text, (t) => {
        const segments = wordSegments(t);
        // The segments tile the text.
        expect(segments.map((s) => t.slice(s.start, s.end)).join('')).toBe(t);
        // Reference: the engine's own one-pass segmentation (Intl.Segmenter, UAX #29).
        const engine = boundaries([...segmenter.segment(t)].map(({ index, segment }) => ({ start: index, end: index + segment.length })));
        const ours = boundaries(segments);
        for (const b of engine) expect(ours.has(b), `engine break at ${b} kept`).toBe(true);
        const cps = [...t];
        let at = 0;
        let base = '';
        const allowed = new Set<number>();
        cps.forEach((c, i) => {
          if (TOKEN_STOPS.has(c.charCodeAt(0)) && at > 0 && !/^[\p{Nd}\u066B]$/u.test(base)) {
            // Before the stop: always a break.
            expect(ours.has(at), `break before the stop at ${at}`).toBe(true);
            let end = at + c.length;
            for (let j = i + 1; j < cps.length && attached.test(cps[j] ?? ''); j++) end += (cps[j] ?? '').length;
            allowed.add(at).add(end);
          }
          if (!attached.test(c)) base = c;
          at += c.length;
        });
        for (const b of ours) if (!engine.has(b)) expect(allowed.has(b), `added break at ${b} is beside a stop`).toBe(true);
      }),
      { seed: 42, numRuns: 5000 },
    );
  });
});
