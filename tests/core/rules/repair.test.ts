import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { REPAIR_STRATEGIES, repairPreview, tagsRepair, transitionsValidate } from '../../../src/core/rules';
import type { RepairStrategy } from '../../../src/core/rules';
import { spansFromTags, tagsFromSpans } from '../../../src/core/schemes';
import { SCHEMES, type Scheme } from '../../../src/core/types';
import { spansArb, tagSequenceArb } from '../schemes/arbitraries';

// Expected results derived by hand from the strategies as documented on RepairStrategy.
const CASES: [Scheme, RepairStrategy, string[], string[]][] = [
  ['iob2', 'begin-span', ['O', 'I-day', 'I-day'], ['O', 'B-day', 'I-day']],
  ['iob2', 'begin-span', ['B-area', 'I-day'], ['B-area', 'B-day']],
  ['iob2', 'begin-span', ['O', 'E-day', 'I-day'], ['O', 'B-day', 'B-day']],
  ['iob2', 'begin-span', ['B-day', 'E-day'], ['B-day', 'I-day']],
  ['iob2', 'begin-span', ['b-day', 'I-day'], ['O', 'B-day']],
  ['iob2', 'drop-stray', ['O', 'I-day', 'I-day'], ['O', 'O', 'O']],
  ['iob2', 'drop-stray', ['B-area', 'I-day', 'O'], ['B-area', 'O', 'O']],
  ['iob2', 'drop-stray', ['B-day', 'E-day'], ['B-day', 'I-day']],
  ['iob2', 'drop-stray', ['S-day', 'I-day'], ['B-day', 'O']],
  ['iob1', 'begin-span', ['O', 'B-day', 'I-day'], ['O', 'I-day', 'I-day']],
  ['iob1', 'begin-span', ['I-area', 'B-day'], ['I-area', 'I-day']],
  ['iob1', 'drop-stray', ['O', 'B-day', 'I-day'], ['O', 'I-day', 'I-day']],
  ['iob1', 'drop-stray', ['O', 'E-day', 'I-day'], ['O', 'O', 'I-day']],
  ['bioes', 'begin-span', ['O', 'I-day', 'E-day'], ['O', 'B-day', 'E-day']],
  ['bioes', 'begin-span', ['B-day', 'O'], ['S-day', 'O']],
  ['bioes', 'begin-span', ['B-day', 'I-day'], ['B-day', 'E-day']],
  ['bioes', 'begin-span', ['B-day', 'I-area', 'E-area'], ['S-day', 'B-area', 'E-area']],
  ['bioes', 'drop-stray', ['O', 'I-day', 'E-day'], ['O', 'O', 'O']],
  ['bioes', 'drop-stray', ['B-day', 'I-day'], ['B-day', 'E-day']],
  ['bioes', 'drop-stray', ['B-day', 'I-area', 'E-area'], ['S-day', 'O', 'O']],
  ['bioes', 'drop-stray', ['E-day'], ['O']],
];

describe('tagsRepair', () => {
  it.each(CASES)('%s %s %j', (scheme, strategy, tags, expected) => {
    const repair = tagsRepair(tags, scheme, strategy);
    expect(repair.before).toEqual(tags);
    expect(repair.after).toEqual(expected);
    const changes = expected.flatMap((to, index) => (tags[index] === to ? [] : [{ index, from: tags[index], to }]));
    expect(repair.changes).toEqual(changes);
    expect(transitionsValidate(repair.after, scheme)).toEqual([]);
  });

  it('returns a before copy that later edits of the input do not reach', () => {
    const tags = ['O', 'I-day'];
    const repair = tagsRepair(tags, 'iob2', 'begin-span');
    tags[1] = 'O';
    expect(repair.before).toEqual(['O', 'I-day']);
  });

  it('every repair validates clean and lists exactly the changed positions', () => {
    fc.assert(
      fc.property(tagSequenceArb, fc.constantFrom(...SCHEMES), fc.constantFrom(...REPAIR_STRATEGIES), (tags, scheme, strategy) => {
        const { before, after, changes } = tagsRepair(tags, scheme, strategy);
        expect(before).toEqual(tags);
        expect(after).toHaveLength(tags.length);
        expect(transitionsValidate(after, scheme)).toEqual([]);
        expect(changes.map((c) => c.index)).toEqual(tags.flatMap((t, i) => (after[i] === t ? [] : [i])));
        for (const { index, from, to } of changes) expect([from, to]).toEqual([tags[index], after[index]]);
      }),
      { seed: 42, numRuns: 3000 },
    );
  });

  it("'begin-span' keeps the decoded spans unchanged", () => {
    fc.assert(
      fc.property(tagSequenceArb, fc.constantFrom(...SCHEMES), (tags, scheme) => {
        expect(spansFromTags(tagsRepair(tags, scheme, 'begin-span').after)).toEqual(spansFromTags(tags));
      }),
      { seed: 42, numRuns: 3000 },
    );
  });

  it("'drop-stray' only removes spans, never adds one, and keeps every span that opens with B-", () => {
    fc.assert(
      fc.property(tagSequenceArb, fc.constantFrom(...SCHEMES), (tags, scheme) => {
        const before = spansFromTags(tags);
        const after = spansFromTags(tagsRepair(tags, scheme, 'drop-stray').after);
        for (const span of after) expect(before).toContainEqual(span);
        for (const span of before) if (tags[span.start]?.startsWith('B-')) expect(after).toContainEqual(span);
      }),
      { seed: 42, numRuns: 3000 },
    );
  });

  it('leaves legal sequences untouched under both strategies', () => {
    fc.assert(
      fc.property(spansArb, fc.constantFrom(...SCHEMES), fc.constantFrom(...REPAIR_STRATEGIES), ({ length, spans }, scheme, strategy) => {
        const tags = tagsFromSpans(spans, length, scheme);
        expect(tagsRepair(tags, scheme, strategy).changes).toEqual([]);
      }),
      { seed: 42, numRuns: 2000 },
    );
  });
});

describe('repairPreview', () => {
  const corpus = [{ tags: ['O', 'I-day'] }, { tags: ['B-day'] }, { tags: ['I-day', 'I-day', 'O', 'I-area'] }];

  it("summarises 'begin-span' on a small corpus (counts derived by hand)", () => {
    const preview = repairPreview(corpus, 'iob2', 'begin-span');
    expect(preview).toMatchObject({ scheme: 'iob2', strategy: 'begin-span', utterances: 3, utterancesChanged: 2, tagsChanged: 3, spansRemoved: 0 });
    expect(preview.changeCounts).toEqual([
      { from: 'I-day', to: 'B-day', count: 2 },
      { from: 'I-area', to: 'B-area', count: 1 },
    ]);
    expect(preview.examples.map((e) => [e.utterance, e.repair.after])).toEqual([
      [0, ['O', 'B-day']],
      [2, ['B-day', 'I-day', 'O', 'B-area']],
    ]);
  });

  it("summarises 'drop-stray' and counts the spans it removes", () => {
    const preview = repairPreview(corpus, 'iob2', 'drop-stray', { exampleLimit: 1 });
    expect(preview).toMatchObject({ utterances: 3, utterancesChanged: 2, tagsChanged: 4, spansRemoved: 3 });
    expect(preview.changeCounts).toEqual([
      { from: 'I-day', to: 'O', count: 3 },
      { from: 'I-area', to: 'O', count: 1 },
    ]);
    expect(preview.examples).toHaveLength(1);
  });

  it('agrees with tagsRepair utterance by utterance on random corpora', () => {
    fc.assert(
      fc.property(fc.array(tagSequenceArb, { maxLength: 12 }), fc.constantFrom(...SCHEMES), fc.constantFrom(...REPAIR_STRATEGIES), (seqs, scheme, strategy) => {
        const utterances = seqs.map((tags) => ({ tags }));
        const preview = repairPreview(utterances, scheme, strategy, { exampleLimit: 100 });
        const repairs = seqs.map((tags) => tagsRepair(tags, scheme, strategy));
        const changed = repairs.filter((r) => r.changes.length > 0);
        expect(preview.utterancesChanged).toBe(changed.length);
        expect(preview.utterancesChanged).toBe(seqs.filter((t) => transitionsValidate(t, scheme).length > 0).length);
        expect(preview.tagsChanged).toBe(changed.reduce((n, r) => n + r.changes.length, 0));
        expect(preview.changeCounts.reduce((n, c) => n + c.count, 0)).toBe(preview.tagsChanged);
        const removed = repairs.reduce((n, r) => n + spansFromTags(r.before).length - spansFromTags(r.after).length, 0);
        expect(preview.spansRemoved).toBe(removed);
        expect(preview.examples.map((e) => e.repair)).toEqual(changed);
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});
