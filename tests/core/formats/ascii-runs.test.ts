import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { NonAsciiFinder } from '../../../src/core/formats/ascii-runs';

function naive(bytes: Uint8Array, from: number, to: number): number {
  for (let i = from; i < to; i++) if ((bytes[i] ?? 0) >= 0x80) return i;
  return -1;
}

describe('NonAsciiFinder', () => {
  it('finds the first byte ≥ 0x80 in a range as a byte-by-byte scan does, at any alignment', () => {
    // Mostly ASCII with rare high bytes, inside a larger buffer at an arbitrary offset.
    const byteArb = fc.oneof({ weight: 20, arbitrary: fc.integer({ min: 0, max: 0x7f }) }, { weight: 1, arbitrary: fc.integer({ min: 0x80, max: 0xff }) });
    fc.assert(
      fc.property(fc.array(byteArb, { minLength: 0, maxLength: 80 }), fc.nat(7), fc.nat(7), fc.nat(90), fc.nat(90), (values, before, after, a, b) => {
        const buffer = new Uint8Array(before + values.length + after).fill(0xff);
        buffer.set(values, before);
        const bytes = buffer.subarray(before, before + values.length);
        const from = Math.min(a, b, values.length);
        const to = Math.min(Math.max(a, b), values.length);
        expect(new NonAsciiFinder(bytes).find(from, to)).toBe(naive(bytes, from, to));
      }),
      { seed: 42, numRuns: 3000 },
    );
  });
});
