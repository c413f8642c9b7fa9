import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { editApply, editChange, layerEditBlank, layerEditSame, tagsNeedLegalising, type EditOp, type LayerEdit } from '../../../src/core/editing';
import { transitionsValidate } from '../../../src/core/rules';
import { SLOTS, tagSequenceArb } from '../schemes/arbitraries';

const base: LayerEdit = { tags: ['O', 'O', 'O'], intent: null, status: 'unlabelled', note: '' };

describe('editApply', () => {
  it('labels, removes, sets intent, status and note; labelling work leaves "unlabelled"', () => {
    const labelled = editApply(base, { kind: 'label', from: 1, to: 2, slot: 'day' });
    expect(labelled).toEqual({ ...base, tags: ['O', 'B-day', 'I-day'], status: 'draft' });
    expect(editApply(labelled, { kind: 'remove', from: 2, to: 2 }).tags).toEqual(['O', 'O', 'O']);
    expect(editApply(base, { kind: 'intent', intent: 'book_visit' })).toEqual({ ...base, intent: 'book_visit', status: 'draft' });
    const done = editApply(labelled, { kind: 'status', status: 'done' });
    expect(done.status).toBe('done');
    expect(editApply(done, { kind: 'label', from: 0, to: 0, slot: 'service' }).status).toBe('done');
    expect(editApply(base, { kind: 'note', note: 'two visits?' }).note).toBe('two visits?');
    expect(editApply(labelled, { kind: 'replace', edit: base })).toEqual(base);
    expect(base.tags).toEqual(['O', 'O', 'O']);
  });

  it('editChange lists only what differs', () => {
    const after = editApply(base, { kind: 'label', from: 0, to: 0, slot: 'area' });
    expect(editChange(base, after)).toEqual({ tags: ['B-area', 'O', 'O'], status: 'draft' });
    expect(editChange(base, base)).toEqual({});
    expect(editChange(base, { ...base, intent: 'cancel', note: 'x' })).toEqual({ intent: 'cancel', note: 'x' });
  });

  it('a blank layer is all O, no intent, unlabelled; tagsNeedLegalising spots illegal stored tags', () => {
    expect(layerEditBlank(2)).toEqual({ tags: ['O', 'O'], intent: null, status: 'unlabelled', note: '' });
    expect(tagsNeedLegalising(['O', 'I-day'])).toBe(true);
    expect(tagsNeedLegalising(['B-day', 'I-day'])).toBe(false);
    expect(layerEditSame(base, { ...base, tags: [...base.tags] })).toBe(true);
    expect(layerEditSame(base, { ...base, note: ' ' })).toBe(false);
  });

  it('property: tag operations on any stored tags give legal IOB2 (zero violations)', () => {
    const opArb: fc.Arbitrary<EditOp> = fc.oneof(
      fc.record({ kind: fc.constant('label' as const), from: fc.nat(15), to: fc.nat(15), slot: fc.constantFrom(...SLOTS) }),
      fc.record({ kind: fc.constant('remove' as const), from: fc.nat(15), to: fc.nat(15) }),
    );
    fc.assert(
      fc.property(tagSequenceArb.filter((t) => t.length > 0), opArb, (tags, op) => {
        const out = editApply({ ...base, tags }, op);
        expect(transitionsValidate(out.tags, 'iob2')).toEqual([]);
        expect(out.tags).toHaveLength(tags.length);
      }),
      { seed: 42, numRuns: 400 },
    );
  });
});
