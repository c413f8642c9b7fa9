import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { KIND_MALFORMED, KIND_O, tagCode, tagCodeKind, tagCodesShareSlot, tagKind, tagsShareSlot } from '../../../src/core/rules/tagKinds';

const tagLike = fc
  .tuple(fc.constantFrom('O', 'B', 'I', 'E', 'S', 'b', ''), fc.constantFrom('-', '', ' '), fc.string({ maxLength: 4, unit: 'binary' }))
  .map(([a, b, c]) => a + b + c);

describe('tagCode', () => {
  it('carries the kind tagKind gives, for every string (cached or not)', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(tagLike, fc.string({ maxLength: 5 })), { minLength: 1, maxLength: 30 }), (tags) => {
        // Each tag twice: the second answer comes from the caches.
        for (const tag of [...tags, ...tags]) expect(tagCodeKind(tagCode(tag))).toBe(tagKind(tag));
      }),
      { seed: 42, numRuns: 2000 },
    );
  });

  it('says two well-formed tags share a slot exactly when tagsShareSlot does', () => {
    const wellFormed = fc.tuple(fc.constantFrom('B', 'I', 'E', 'S'), fc.constantFrom('day', 'dax', 'days', 'área', 'a', 'b')).map(([p, s]) => `${p}-${s}`);
    fc.assert(
      fc.property(wellFormed, wellFormed, (a, b) => {
        expect(tagCodesShareSlot(a, tagCode(a), b, tagCode(b))).toBe(tagsShareSlot(a, b));
      }),
      { seed: 42, numRuns: 1000 },
    );
  });

  it('reads the short tags without the caches: O, and empty or two-character strings as malformed', () => {
    expect(tagCode('O')).toBe(KIND_O);
    expect(tagCode('')).toBe(KIND_MALFORMED);
    expect(tagCode('o')).toBe(KIND_MALFORMED);
    expect(tagCode('B-')).toBe(KIND_MALFORMED);
  });

  it('stays right past its memory bounds (thousands of distinct slots)', () => {
    const slots = Array.from({ length: 6000 }, (_, i) => `slot${i}`);
    for (const slot of slots) tagCode(`B-${slot}`);
    // Slots met after the bound get no number and are compared as strings; earlier ones keep theirs.
    for (const [a, b] of [
      ['B-slot1', 'I-slot1'],
      ['B-slot5999', 'I-slot5999'],
      ['B-slot5999', 'I-slot5998'],
      ['B-slot1', 'I-slot5999'],
      ['I-slot7', 'E-slot70'],
    ] as const) {
      expect(tagCodesShareSlot(a, tagCode(a), b, tagCode(b))).toBe(tagsShareSlot(a, b));
    }
  });
});
