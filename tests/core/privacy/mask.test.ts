import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { textMask } from '../../../src/core/privacy';

describe('textMask', () => {
  it('masks digits and e-mail addresses in an invented booking message', () => {
    const text = 'call me on 555-0142 or mail dana.k@example.org before 9';
    expect(textMask(text, ['digits'])).toBe('call me on 000-0000 or mail dana.k@example.org before 0');
    const hidden = '*'.repeat('dana.k@example.org'.length);
    expect(textMask(text, ['email'])).toBe(`call me on 555-0142 or mail ${hidden} before 9`);
    expect(textMask(text, ['digits', 'email'])).toBe(`call me on 000-0000 or mail ${hidden} before 0`);
  });

  it('masks non-ASCII decimal digits (Unicode category Nd, e.g. Arabic-Indic) as well', () => {
    // U+0661..U+0663 are ARABIC-INDIC DIGIT ONE..THREE, general category Nd (Unicode Character Database).
    expect(textMask('رقم ١٢٣', ['digits'])).toBe('رقم 000');
  });

  it('keeps the UTF-16 length, so token offsets stay valid (property)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme' }), fc.subarray(['digits', 'email'] as const), (text, kinds) => {
        expect(textMask(text, kinds).length).toBe(text.length);
      }),
      { seed: 7, numRuns: 500 },
    );
  });

  it('leaves no decimal digit behind when digits are masked (property)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary' }), (text) => {
        expect(/\p{Nd}/u.test(textMask(text, ['digits']).replace(/0/g, ''))).toBe(false);
      }),
      { seed: 11, numRuns: 500 },
    );
  });
});
