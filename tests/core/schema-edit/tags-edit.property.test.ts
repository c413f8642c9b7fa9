import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { tagsConvert, spansFromTags, tagParse } from '../../../src/core/schemes';
import { tagsSlotDelete, tagsSlotRename, tagsSlotSpanCount, tagsUseSlot } from '../../../src/core/schema-edit';
import { SCHEMES } from '../../../src/core/types';

// Names that share prefixes (area, area.from), so a rename that matched by prefix would show up.
const SLOTS = ['area', 'area.from', 'day', 'service'] as const;
const FRESH = 'area.to';
const MALFORMED = ['B-', 'b-area', 'Q-area', 'B-two words', '', 'O-area', 'Barea', 'B-area ', 'I-'];

const tagArb = fc.oneof(
  { weight: 3, arbitrary: fc.constant('O') },
  { weight: 8, arbitrary: fc.tuple(fc.constantFrom('B', 'I', 'E', 'S'), fc.constantFrom(...SLOTS)).map(([p, s]) => `${p}-${s}`) },
  { weight: 1, arbitrary: fc.constantFrom(...MALFORMED) },
);
const tagsArb = fc.array(tagArb, { maxLength: 16 });
const slotArb = fc.constantFrom(...SLOTS);
const RUNS = { seed: 42, numRuns: 2000 };

const spansOf = (tags: readonly string[], slot: string) => spansFromTags(tags).filter((s) => s.slot === slot);

describe('slot rename on tags', () => {
  it('renaming to a fresh name and back gives the tags back exactly', () => {
    fc.assert(
      fc.property(tagsArb, slotArb, (tags, slot) => {
        expect(tagsSlotRename(tagsSlotRename(tags, slot, FRESH), FRESH, slot)).toEqual(tags);
      }),
      RUNS,
    );
  });

  it('keeps every prefix and every other tag, so the spans are the same spans under the new name', () => {
    fc.assert(
      fc.property(tagsArb, slotArb, (tags, slot) => {
        const renamed = tagsSlotRename(tags, slot, FRESH);
        expect(renamed).toHaveLength(tags.length);
        renamed.forEach((tag, i) => {
          const old = tags[i] as string;
          const parsed = tagParse(old);
          if (parsed !== null && parsed.prefix !== 'O' && parsed.slot === slot) expect(tag).toBe(`${parsed.prefix}-${FRESH}`);
          else expect(tag).toBe(old);
        });
        // Illegal sequences stay illegal in the same places: the lenient reading gives the same spans.
        const rename = (name: string) => (name === slot ? FRESH : name);
        expect(spansFromTags(renamed)).toEqual(spansFromTags(tags).map((s) => ({ ...s, slot: rename(s.slot) })));
        expect(tagsUseSlot(renamed, slot)).toBe(false);
      }),
      RUNS,
    );
  });

  it('returns the same array when the slot is absent', () => {
    fc.assert(
      fc.property(tagsArb, (tags) => {
        expect(tagsSlotRename(tags, 'budget', FRESH)).toBe(tags);
        expect(tagsSlotDelete(tags, 'budget')).toBe(tags);
      }),
      RUNS,
    );
  });
});

describe('slot delete on tags', () => {
  it('leaves no tag of the slot, turns exactly its tags into O and keeps the others', () => {
    fc.assert(
      fc.property(tagsArb, slotArb, (tags, slot) => {
        const deleted = tagsSlotDelete(tags, slot);
        expect(tagsUseSlot(deleted, slot)).toBe(false);
        expect(spansOf(deleted, slot)).toEqual([]);
        deleted.forEach((tag, i) => {
          const parsed = tagParse(tags[i] as string);
          expect(tag).toBe(parsed !== null && parsed.prefix !== 'O' && parsed.slot === slot ? 'O' : tags[i]);
        });
      }),
      RUNS,
    );
  });

  it('keeps legal IOB2 and BIOES legal, with the other slots’ spans unchanged', () => {
    fc.assert(
      fc.property(tagsArb, slotArb, (raw, slot) => {
        for (const scheme of ['iob2', 'bioes'] as const) {
          const tags = tagsConvert(raw, scheme);
          const deleted = tagsSlotDelete(tags, slot);
          expect(deleted).toEqual(tagsConvert(deleted, scheme));
          expect(spansFromTags(deleted)).toEqual(spansFromTags(tags).filter((s) => s.slot !== slot));
        }
      }),
      RUNS,
    );
  });
});

describe('span counts', () => {
  it('equal the spansFromTags count of the slot, on legal and illegal sequences of every scheme', () => {
    fc.assert(
      fc.property(tagsArb, slotArb, (tags, slot) => {
        expect(tagsSlotSpanCount(tags, slot)).toBe(spansOf(tags, slot).length);
        for (const scheme of SCHEMES) {
          const legal = tagsConvert(tags, scheme);
          expect(tagsSlotSpanCount(legal, slot)).toBe(spansOf(legal, slot).length);
        }
      }),
      RUNS,
    );
  });

  it('are kept by a rename and dropped to zero by a delete', () => {
    fc.assert(
      fc.property(tagsArb, slotArb, (tags, slot) => {
        expect(tagsSlotSpanCount(tagsSlotRename(tags, slot, FRESH), FRESH)).toBe(tagsSlotSpanCount(tags, slot));
        expect(tagsSlotSpanCount(tagsSlotDelete(tags, slot), slot)).toBe(0);
      }),
      RUNS,
    );
  });

  it('count worked examples by hand', () => {
    // B I I is one span; a stray I after O starts one (CoNLL-2000 evaluation convention); B B is two.
    expect(tagsSlotSpanCount(['B-area', 'I-area', 'I-area', 'O', 'I-area'], 'area')).toBe(2);
    expect(tagsSlotSpanCount(['B-area', 'B-area', 'I-area.from'], 'area')).toBe(2);
    expect(tagsSlotSpanCount(['B-area', 'I-area.from', 'I-area'], 'area')).toBe(2);
    expect(tagsSlotSpanCount(['S-day', 'E-day', 'B-day', 'E-day'], 'day')).toBe(3);
  });
});
