import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  selectionCaret,
  selectionClamp,
  selectionFromClick,
  selectionMove,
  selectionRange,
  selectionTarget,
  tokenIndexAt,
} from '../../../src/core/editing';
import { tokeniseWhitespace } from '../../../src/core/tokenise';

describe('selection', () => {
  it('arrows move a caret, shift extends from the anchor, both stop at the ends', () => {
    let s = selectionCaret(1);
    s = selectionMove(s, 1, 4, false);
    expect(s).toEqual({ anchor: 2, focus: 2 });
    s = selectionMove(s, 1, 4, true);
    s = selectionMove(s, 1, 4, true);
    expect(s).toEqual({ anchor: 2, focus: 3 });
    expect(selectionRange(s, 4)).toEqual({ from: 2, to: 3 });
    s = selectionMove(s, -1, 4, true);
    s = selectionMove(s, -1, 4, true);
    expect(s).toEqual({ anchor: 2, focus: 1 });
    expect(selectionRange(s, 4)).toEqual({ from: 1, to: 2 });
    expect(selectionMove(selectionCaret(0), -1, 4, false)).toEqual(selectionCaret(0));
  });

  it('an arrow without shift collapses a range to its edge in that direction', () => {
    expect(selectionMove({ anchor: 3, focus: 1 }, 1, 5, false)).toEqual(selectionCaret(3));
    expect(selectionMove({ anchor: 3, focus: 1 }, -1, 5, false)).toEqual(selectionCaret(1));
  });

  it('a click on a labelled token selects its span; a caret in a span targets the whole span', () => {
    const tags = ['O', 'B-day', 'I-day', 'O'];
    expect(selectionFromClick(tags, 2)).toEqual({ anchor: 1, focus: 2 });
    expect(selectionFromClick(tags, 3)).toEqual(selectionCaret(3));
    expect(selectionTarget(tags, selectionCaret(2))).toEqual({ from: 1, to: 2 });
    expect(selectionTarget(tags, { anchor: 2, focus: 3 })).toEqual({ from: 2, to: 3 });
    expect(selectionTarget([], selectionCaret(0))).toBeNull();
  });

  it('snaps a text offset to the token containing it, else to the nearest token', () => {
    // "fix  the tap": tokens [0,3) [5,8) [9,12)
    const tokens = tokeniseWhitespace('fix  the tap');
    expect(tokens).toEqual([
      { start: 0, end: 3 },
      { start: 5, end: 8 },
      { start: 9, end: 12 },
    ]);
    expect(tokenIndexAt(tokens, 0)).toBe(0);
    expect(tokenIndexAt(tokens, 2)).toBe(0);
    expect(tokenIndexAt(tokens, 3)).toBe(0);
    expect(tokenIndexAt(tokens, 4)).toBe(0);
    expect(tokenIndexAt(tokens, 5)).toBe(1);
    expect(tokenIndexAt(tokens, 8)).toBe(1);
    expect(tokenIndexAt(tokens, 12)).toBe(2);
    expect(tokenIndexAt(tokens, 40)).toBe(2);
    expect(tokenIndexAt([], 3)).toBe(-1);
  });

  it('property: moves stay inside the utterance and a range always covers anchor and focus', () => {
    const stepArb = fc.tuple(fc.integer({ min: -3, max: 3 }), fc.boolean());
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 12 }), fc.array(stepArb, { maxLength: 20 }), (length, steps) => {
        let s = selectionCaret(0);
        for (const [delta, extend] of steps) {
          const before = s;
          s = selectionMove(s, delta, length, extend);
          for (const i of [s.anchor, s.focus]) expect(i >= 0 && i < length).toBe(true);
          if (extend) expect(s.anchor).toBe(before.anchor);
          else expect(s.anchor).toBe(s.focus);
          const r = selectionRange(s, length);
          expect(r?.from).toBe(Math.min(s.anchor, s.focus));
          expect(r?.to).toBe(Math.max(s.anchor, s.focus));
        }
        expect(selectionClamp({ anchor: length + 5, focus: -2 }, length)).toEqual({ anchor: length - 1, focus: 0 });
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('property: every offset snaps to a token at least as near as any other', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.nat(3), fc.integer({ min: 1, max: 4 })), { minLength: 1, maxLength: 8 }), fc.nat(60), (gaps, offset) => {
        const tokens: { start: number; end: number }[] = [];
        let at = 0;
        for (const [gap, width] of gaps) {
          tokens.push({ start: at + gap, end: at + gap + width });
          at += gap + width;
        }
        const distance = (t: { start: number; end: number }) => (offset < t.start ? t.start - offset : offset > t.end ? offset - t.end : 0);
        const chosen = tokens[tokenIndexAt(tokens, offset)];
        expect(chosen).toBeDefined();
        const best = Math.min(...tokens.map(distance));
        expect(distance(chosen as { start: number; end: number })).toBe(best);
      }),
      { seed: 42, numRuns: 300 },
    );
  });
});
