import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { layerTagsRepair, tagsChangedAt, tokensAround } from '../../../src/core/adjudication';
import { REPAIR_STRATEGIES, schemaValidate, transitionsValidate, type LabelSchema } from '../../../src/core/rules';
import { SCHEMES } from '../../../src/core/types';
import { tagsOf } from './arbitraries';

const SCHEMA: LabelSchema = { slots: ['day', 'area', 'service'], intents: ['book_visit', 'check_status'], allowedSlotsByIntent: { check_status: ['day'] } };

describe('layerTagsRepair', () => {
  it('mends a stray I-X as the CoNLL-2000 evaluation reads it, or drops it to O', () => {
    const tags = ['O', 'I-day', 'O'];
    expect(layerTagsRepair(tags, null, 'iob2', { strategy: 'begin-span' })).toEqual(['O', 'B-day', 'O']);
    expect(layerTagsRepair(tags, null, 'iob2', { strategy: 'drop-stray' })).toEqual(['O', 'O', 'O']);
  });

  it('with a schema, also drops spans whose slot is unknown or not allowed for the intent', () => {
    const tags = ['B-area', 'O', 'B-day', 'B-budget', 'I-budget'];
    expect(layerTagsRepair(tags, 'check_status', 'iob2', { strategy: 'begin-span', schema: SCHEMA })).toEqual(['O', 'O', 'B-day', 'O', 'O']);
    expect(layerTagsRepair(tags, 'check_status', 'iob2', { strategy: 'begin-span' })).toEqual(tags);
  });

  it('property: the result validates clean in its scheme, and with the schema no span issue is left', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 12 }).chain((n) => tagsOf(n)),
        fc.constantFrom(...SCHEMES),
        fc.constantFrom(...REPAIR_STRATEGIES),
        fc.constantFrom('book_visit', 'check_status', null),
        (tags, scheme, strategy, intent) => {
          const after = layerTagsRepair(tags, intent, scheme, { strategy, schema: SCHEMA });
          expect(transitionsValidate(after, scheme)).toEqual([]);
          expect(schemaValidate({ tags: after, intent: intent ?? undefined }, SCHEMA).filter((i) => i.index !== null)).toEqual([]);
          // Legal, schema-clean input is left exactly as it was.
          if (transitionsValidate(tags, scheme).length === 0 && schemaValidate({ tags, intent: intent ?? undefined }, SCHEMA).length === 0) expect(after).toEqual(tags);
        },
      ),
      { seed: 42, numRuns: 800 },
    );
  });

  it('reports changed positions and shows a finding with its neighbours', () => {
    expect(tagsChangedAt(['O', 'I-day', 'O'], ['O', 'B-day', 'O'])).toEqual([1]);
    const words = ['can', 'you', 'come', 'on', 'friday', 'morning'];
    const tags = ['O', 'O', 'O', 'O', 'I-day', 'O'];
    expect(tokensAround(words, tags, 4, 1)).toEqual([
      { index: 3, word: 'on', tag: 'O', focus: false },
      { index: 4, word: 'friday', tag: 'I-day', focus: true },
      { index: 5, word: 'morning', tag: 'O', focus: false },
    ]);
  });
});
