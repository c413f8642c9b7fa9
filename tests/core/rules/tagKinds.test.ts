import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { KIND_B, KIND_E, KIND_I, KIND_MALFORMED, KIND_O, KIND_S, tagKind, tagsShareSlot } from '../../../src/core/rules/tagKinds';
import { tagParse } from '../../../src/core/schemes';

const KIND_OF_PREFIX: Record<string, number> = { O: KIND_O, B: KIND_B, I: KIND_I, E: KIND_E, S: KIND_S };

function kindByParse(tag: string): number {
  const parsed = tagParse(tag);
  return parsed === null ? KIND_MALFORMED : (KIND_OF_PREFIX[parsed.prefix] ?? -1);
}

describe('tagKind reads tags as tagParse does', () => {
  it('for every BMP code unit inside a slot name (the whitespace test)', () => {
    for (let c = 0; c <= 0xffff; c++) {
      const tag = `B-a${String.fromCharCode(c)}b`;
      if (tagKind(tag) !== kindByParse(tag)) expect.fail(`disagree on U+${c.toString(16)}`);
    }
  });

  it('on random strings shaped like tags', () => {
    const shaped = fc
      .tuple(fc.constantFrom('O', 'B', 'I', 'E', 'S', 'b', 'Q', '', '-'), fc.constantFrom('-', '', '_', ' '), fc.string({ maxLength: 5, unit: 'binary' }))
      .map(([a, b, c]) => a + b + c);
    fc.assert(
      fc.property(fc.oneof(shaped, fc.string({ maxLength: 6 })), (tag) => {
        expect(tagKind(tag)).toBe(kindByParse(tag));
      }),
      { seed: 42, numRuns: 5000 },
    );
  });

  it('compares slots after the prefix only', () => {
    expect(tagsShareSlot('B-day', 'I-day')).toBe(true);
    expect(tagsShareSlot('B-day', 'I-dax')).toBe(false);
    expect(tagsShareSlot('B-day', 'I-days')).toBe(false);
  });
});
