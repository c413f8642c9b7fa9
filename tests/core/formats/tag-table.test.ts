import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { TagTable, TRIE_ROOT, TRIE_SHIFT } from '../../../src/core/formats/tag-table';
import { tagKind } from '../../../src/core/rules/tagKinds';
import { tagParse } from '../../../src/core/schemes';

describe('TagTable', () => {
  it('gives one shared entry per distinct tag, parsed as tagParse and tagKind read it', () => {
    const tagArb = fc.oneof(fc.constantFrom('O', 'B-day', 'I-day', 'B-día', 'Q-x', 'B-', 'S-地区'), fc.string({ minLength: 1, maxLength: 6 }));
    fc.assert(
      fc.property(fc.array(tagArb, { minLength: 1, maxLength: 40 }), (tags) => {
        const table = new TagTable();
        const seen = new Map<string, unknown>();
        for (const tag of [...tags, ...tags]) {
          const line = `tok\t${tag}\n`;
          const entry = table.find(line, 4, 4 + tag.length);
          expect(entry.tag).toBe(tag);
          expect(entry.parsed).toEqual(tagParse(tag));
          expect(entry.kind).toBe(tagKind(tag));
          if (seen.has(tag)) expect(entry).toBe(seen.get(tag));
          seen.set(tag, entry);
          expect(table.lookup(line, 4, 4 + tag.length)).toBe(entry);
        }
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('keeps finding tags once its trie is full', () => {
    const table = new TagTable();
    const tags = Array.from({ length: 3000 }, (_, i) => `B-slot_${i}`);
    const entries = tags.map((tag) => table.find(tag, 0, tag.length));
    tags.forEach((tag, i) => expect(table.find(`x ${tag}`, 2, 2 + tag.length)).toBe(entries[i]));
  });

  it('walks its trie to the entry for ASCII tags once they are filed', () => {
    const table = new TagTable();
    const entry = table.find('I-time_window', 0, 13);
    let row = TRIE_ROOT;
    for (const char of 'I-time_window') row = table.trie[row + char.charCodeAt(0)] ?? 0;
    expect(table.entries[row >> TRIE_SHIFT]).toBe(entry);
  });
});
