import fc from 'fast-check';
import type { Span } from '../../../src/core/types';

/** Shared random inputs for scheme and rule tests (home-repair slot names, invented). */
export const SLOTS = ['day', 'area', 'service'] as const;

export const MALFORMED_TAGS = ['B-', 'b-day', 'Q-day', 'B-two words', '', 'O-day', 'Bday'] as const;

const slotArb = fc.constantFrom(...SLOTS);

/** Tags over every prefix, so both legal and illegal transitions of each scheme come up. */
export const tagArb: fc.Arbitrary<string> = fc.oneof(
  { weight: 3, arbitrary: fc.constant('O') },
  { weight: 8, arbitrary: fc.tuple(fc.constantFrom('B', 'I', 'E', 'S'), slotArb).map(([p, s]) => `${p}-${s}`) },
  { weight: 1, arbitrary: fc.constantFrom(...MALFORMED_TAGS) },
);

export const tagSequenceArb: fc.Arbitrary<string[]> = fc.array(tagArb, { maxLength: 14 });

/** Only O, B- and I- tags: what NLTK's IOB reader accepts. */
export const iobTagSequenceArb: fc.Arbitrary<string[]> = fc.array(
  fc.oneof(
    { weight: 2, arbitrary: fc.constant('O') },
    { weight: 5, arbitrary: fc.tuple(fc.constantFrom('B', 'I'), slotArb).map(([p, s]) => `${p}-${s}`) },
  ),
  { maxLength: 16 },
);

/**
 * Well-formed spans over `length` tokens. Each token is outside, or in a slot and either starting a
 * new span or extending the previous one, so adjacent spans of one slot come up often.
 */
export const spansArb: fc.Arbitrary<{ length: number; spans: Span[] }> = fc
  .array(fc.option(fc.tuple(slotArb, fc.boolean()), { nil: null, freq: 3 }), { maxLength: 14 })
  .map((cells) => {
    const spans: Span[] = [];
    let open: Span | null = null;
    cells.forEach((cell, i) => {
      if (cell === null) {
        open = null;
        return;
      }
      const [slot, startsNew] = cell;
      if (open !== null && !startsNew && open.slot === slot) {
        open.end = i + 1;
      } else {
        open = { start: i, end: i + 1, slot };
        spans.push(open);
      }
    });
    return { length: cells.length, spans };
  });
