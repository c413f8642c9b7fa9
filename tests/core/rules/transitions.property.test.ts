import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { transitionsValidate } from '../../../src/core/rules';
import { SCHEMES, type Scheme } from '../../../src/core/types';
import { SLOTS, tagSequenceArb } from '../schemes/arbitraries';

/*
 * A deliberately simple reference validator: for each scheme, the full table of allowed
 * (previous, next) pairs over the tags of its grammar, written out from the grammar as the task
 * states it. It shares no code with src/core/rules.
 */
const START = '<start>';
const END = '<end>';

const tagsWith = (prefixes: string[]): string[] => ['O', ...prefixes.flatMap((p) => SLOTS.map((s) => `${p}-${s}`))];
const GRAMMAR: Record<Scheme, string[]> = { iob1: tagsWith(['B', 'I']), iob2: tagsWith(['B', 'I']), bioes: tagsWith(['B', 'I', 'E', 'S']) };

function legal(scheme: Scheme, previous: string, next: string): boolean {
  const slotOf = (tag: string) => tag.slice(2);
  const prefixOf = (tag: string) => (tag === START || tag === END ? tag : tag[0]);
  const p = prefixOf(previous);
  const n = prefixOf(next);
  switch (scheme) {
    case 'iob2': // I-X only right after B-X or I-X; everything else anywhere.
      return n !== 'I' || ((p === 'B' || p === 'I') && slotOf(previous) === slotOf(next));
    case 'iob1': // B-X only right after B-X or I-X; everything else anywhere.
      return n !== 'B' || ((p === 'B' || p === 'I') && slotOf(previous) === slotOf(next));
    case 'bioes': // after start/O/E/S: O, B, S or the end; after B-X/I-X: I-X or E-X only.
      if (p === START || p === 'O' || p === 'E' || p === 'S') return n === 'O' || n === 'B' || n === 'S' || n === END;
      return (n === 'I' || n === 'E') && slotOf(previous) === slotOf(next);
  }
  return false;
}

const ALLOWED: Record<Scheme, Set<string>> = { iob1: new Set(), iob2: new Set(), bioes: new Set() };
for (const scheme of SCHEMES) {
  for (const previous of [START, ...GRAMMAR[scheme]]) {
    for (const next of [...GRAMMAR[scheme], END]) {
      if (legal(scheme, previous, next)) ALLOWED[scheme].add(`${previous} ${next}`);
    }
  }
}

interface Marked {
  index: number;
  previous: string | null;
  tag: string | null;
}

// A tag outside the grammar is marked where it stands; the pair after it is not judged (documented
// behaviour of transitionsValidate: one report per stray tag).
function referenceMarks(tags: readonly string[], scheme: Scheme): Marked[] {
  const grammar = new Set(GRAMMAR[scheme]);
  const marks: Marked[] = [];
  for (let i = 0; i <= tags.length; i++) {
    const previous = i === 0 ? START : (tags[i - 1] as string);
    const next = i === tags.length ? END : (tags[i] as string);
    const mark = { index: Math.min(i, tags.length - 1), previous: i === 0 ? null : previous, tag: next === END ? null : next };
    if (next !== END && !grammar.has(next)) marks.push(mark);
    else if (previous !== START && !grammar.has(previous)) continue;
    else if (!ALLOWED[scheme].has(`${previous} ${next}`)) marks.push(mark);
  }
  return marks;
}

describe('transitionsValidate against a pair-table reference validator', () => {
  it('has the expected table sizes (sanity of the reference itself)', () => {
    // Counted by hand, 3 slots. IOB2 rows START, O, B-*, I-* (8) each allow O, B-* and the end (5),
    // and the 6 B-/I- rows also their own slot's I-; IOB1 likewise with B and I swapped.
    expect(ALLOWED.iob2.size).toBe(8 * 5 + 6);
    expect(ALLOWED.iob1.size).toBe(8 * 5 + 6);
    // BIOES: rows START,O,E*3,S*3 = 8, each allowing O, B*3, S*3, end = 8; rows B*3,I*3 allow 2 each.
    expect(ALLOWED.bioes.size).toBe(8 * 8 + 6 * 2);
  });

  for (const scheme of SCHEMES) {
    it(`${scheme}: reports exactly the marked transitions`, () => {
      fc.assert(
        fc.property(tagSequenceArb, (tags) => {
          const got = transitionsValidate(tags, scheme);
          expect(got.map(({ index, previous, tag }) => ({ index, previous, tag }))).toEqual(referenceMarks(tags, scheme));
          for (const violation of got) {
            expect(violation.rule.startsWith(`${scheme}/`)).toBe(true);
            expect(violation.message).toContain(violation.tag === null ? (violation.previous ?? '') : JSON.stringify(violation.tag).slice(1, -1));
          }
        }),
        { seed: 42, numRuns: 3000 },
      );
    });
  }
});
