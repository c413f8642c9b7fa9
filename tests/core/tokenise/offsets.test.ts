import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  codePointCount,
  offsetFromCodePoints,
  offsetsFromCodePoints,
  offsetSplitsSurrogatePair,
  offsetsToCodePoints,
  offsetToCodePoints,
} from '../../../src/core/tokenise';
import { textArbitrary } from './textArbitrary';

const RUNS = { seed: 42, numRuns: 400 };
const range = (n: number) => Array.from({ length: n }, (_, i) => i);

describe('code-point offsets, worked examples', () => {
  // 🔧 is U+1F527, one code point in two UTF-16 units; e + U+0301 is two code points.
  const text = 'fix 🔧 cafe\u0301';

  it('converts offsets after an astral character', () => {
    expect(codePointCount(text)).toBe(11);
    expect(offsetToCodePoints(text, 4)).toBe(4);
    expect(offsetToCodePoints(text, 6)).toBe(5);
    expect(offsetToCodePoints(text, 12)).toBe(11);
    expect(offsetFromCodePoints(text, 5)).toBe(6);
    expect(offsetFromCodePoints(text, 11)).toBe(12);
  });

  it('reports -1 inside a surrogate pair, out of range and for non-integers', () => {
    expect(offsetSplitsSurrogatePair(text, 5)).toBe(true);
    expect(offsetToCodePoints(text, 5)).toBe(-1);
    expect(offsetToCodePoints(text, -1)).toBe(-1);
    expect(offsetToCodePoints(text, 13)).toBe(-1);
    expect(offsetToCodePoints(text, 1.5)).toBe(-1);
    expect(offsetToCodePoints(text, Number.NaN)).toBe(-1);
    expect(offsetFromCodePoints(text, 12)).toBe(-1);
    expect(offsetFromCodePoints(text, -1)).toBe(-1);
    expect(offsetFromCodePoints(text, 0.5)).toBe(-1);
    expect(offsetsToCodePoints(text, [5, -1, 13, 1.5, 6])).toEqual([-1, -1, -1, -1, 5]);
    expect(offsetsFromCodePoints(text, [12, -1, 0.5, 5])).toEqual([-1, -1, -1, 6]);
  });

  it('counts a lone surrogate as one code point, as JavaScript iteration and Python do', () => {
    const lone = 'a\uD83Db\uDE00';
    expect(codePointCount(lone)).toBe(4);
    expect(offsetsToCodePoints(lone, range(5))).toEqual([0, 1, 2, 3, 4]);
    expect(offsetSplitsSurrogatePair(lone, 2)).toBe(false);
  });

  it('handles the empty text', () => {
    expect(codePointCount('')).toBe(0);
    expect(offsetToCodePoints('', 0)).toBe(0);
    expect(offsetFromCodePoints('', 0)).toBe(0);
    expect(offsetsToCodePoints('', [0, 1])).toEqual([0, -1]);
  });
});

describe('code-point offsets, properties', () => {
  it('counts code points as [...text].length', () => {
    fc.assert(fc.property(textArbitrary, (text) => codePointCount(text) === [...text].length), RUNS);
  });

  it('maps each UTF-16 offset to the code points before it, or -1 inside a pair', () => {
    fc.assert(
      fc.property(textArbitrary, (text) => {
        const expected = range(text.length + 1).map((i) => (offsetSplitsSurrogatePair(text, i) ? -1 : [...text.slice(0, i)].length));
        expect(range(text.length + 1).map((i) => offsetToCodePoints(text, i))).toEqual(expected);
        expect(offsetsToCodePoints(text, range(text.length + 1))).toEqual(expected);
      }),
      RUNS,
    );
  });

  it('round-trips code-point offsets, single and batch alike', () => {
    fc.assert(
      fc.property(textArbitrary, (text) => {
        const codePoints = range(codePointCount(text) + 1);
        const offsets = offsetsFromCodePoints(text, codePoints);
        expect(codePoints.map((cp) => offsetFromCodePoints(text, cp))).toEqual(offsets);
        expect(offsets.every((offset) => offset >= 0 && !offsetSplitsSurrogatePair(text, offset))).toBe(true);
        expect(offsetsToCodePoints(text, offsets)).toEqual(codePoints);
        // Slicing by the converted offsets gives the same characters as slicing the code-point array.
        codePoints.forEach((cp) => expect(text.slice(0, offsets[cp])).toBe([...text].slice(0, cp).join('')));
      }),
      RUNS,
    );
  });

  it('accepts offsets in any order and repeated in a batch', () => {
    fc.assert(
      fc.property(textArbitrary, fc.array(fc.integer({ min: -2, max: 30 })), (text, offsets) => {
        expect(offsetsToCodePoints(text, offsets)).toEqual(offsets.map((offset) => offsetToCodePoints(text, offset)));
        expect(offsetsFromCodePoints(text, offsets)).toEqual(offsets.map((cp) => offsetFromCodePoints(text, cp)));
      }),
      RUNS,
    );
  });
});

// Outside reference: CPython's str, which indexes by code point (Python Language Reference, "Sequence
// types: str"); Debian's interpreter at /usr/bin/python3. It receives the texts as JSON, where lone
// surrogates travel as \u escapes, and answers with len(text) and the UTF-16 offset of every
// code-point prefix (utf-16-le with surrogatepass, so lone surrogates count as one unit).
describe("code-point offsets against Python's view", () => {
  it('agree with len() and prefix slicing on random texts', () => {
    const python = '/usr/bin/python3';
    expect(existsSync(python), `${python} is missing: install Debian's python3`).toBe(true);
    const texts = fc.sample(textArbitrary, { seed: 42, numRuns: 300 });
    const script = [
      'import json, sys',
      'texts = json.load(sys.stdin)',
      "print(json.dumps([[len(t), [len(t[:k].encode('utf-16-le', 'surrogatepass')) // 2 for k in range(len(t) + 1)]] for t in texts]))",
    ].join('\n');
    const run = spawnSync(python, ['-c', script], { input: JSON.stringify(texts), encoding: 'utf8' });
    expect(run.status, run.stderr).toBe(0);
    const answers = JSON.parse(run.stdout) as [number, number[]][];
    expect(answers).toHaveLength(texts.length);
    texts.forEach((text, i) => {
      const [length, offsets] = answers[i] ?? [Number.NaN, []];
      expect(codePointCount(text)).toBe(length);
      expect(offsetsFromCodePoints(text, range(length + 1))).toEqual(offsets);
      expect(offsetsToCodePoints(text, offsets)).toEqual(range(length + 1));
    });
  });
});
