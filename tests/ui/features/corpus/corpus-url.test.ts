import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LAYER_STATUSES } from '../../../../src/core/backup/model';
import { CORPUS_SORT_KEYS, type CorpusFilter } from '../../../../src/db/corpus-query';
import { queryParse, queryText } from '../../../../src/state/nav';
import {
  corpusFilterCount,
  corpusStateFromQuery,
  corpusStateNeedsIndex,
  corpusStateToQuery,
  type CorpusViewState,
} from '../../../../src/ui/features/corpus/corpus-url';

describe('utterance table state in the URL', () => {
  it('reads a shared link and writes it back the same', () => {
    const query = queryParse('by=ann-b&differ=1&intent=book_visit&layer=ann-a&problems=1&q=leaking%20tap&slot=area.from&sort=-violations&status=done');
    const state = corpusStateFromQuery(query);
    expect(state).toEqual({
      filter: { text: 'leaking tap', slot: 'area.from', intent: 'book_visit', status: 'done', annotator: 'ann-b', violations: true, disagreement: true },
      sort: { key: 'violations', desc: true },
      layer: 'ann-a',
    });
    expect(corpusStateToQuery(state)).toEqual(query);
  });

  it('drops what does not parse and leaves the default sort out', () => {
    const state = corpusStateFromQuery({ status: 'finished', sort: '-colour', problems: 'yes', differ: '0', q: '' });
    expect(state).toEqual({ filter: {}, sort: { key: 'id', desc: false }, layer: null });
    expect(corpusStateToQuery(state)).toEqual({});
    expect(corpusStateToQuery({ ...state, sort: { key: 'id', desc: true } })).toEqual({ sort: '-id' });
  });

  it('round-trips every state through the URL text (property)', () => {
    const name = fc.stringMatching(/^[a-z_.-]{1,12}$/);
    const filterArb: fc.Arbitrary<CorpusFilter> = fc.record(
      {
        text: fc.string({ minLength: 1, maxLength: 20 }),
        slot: name,
        intent: name,
        status: fc.constantFrom(...LAYER_STATUSES),
        annotator: name,
        violations: fc.constant(true),
        disagreement: fc.constant(true),
      },
      { requiredKeys: [] },
    );
    const stateArb: fc.Arbitrary<CorpusViewState> = fc.record({
      filter: filterArb,
      sort: fc.record({ key: fc.constantFrom(...CORPUS_SORT_KEYS), desc: fc.boolean() }),
      layer: fc.option(name),
    });
    fc.assert(
      fc.property(stateArb, (state) => {
        // Through the same text form the hash uses (src/state/nav.ts).
        const back = corpusStateFromQuery(queryParse(queryText(corpusStateToQuery(state))));
        expect(back).toEqual(state);
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('needs the index only when filtering or sorting by something other than seq', () => {
    const plain = corpusStateFromQuery({});
    expect(corpusStateNeedsIndex(plain, false)).toBe(false);
    expect(corpusStateNeedsIndex({ ...plain, sort: { key: 'id', desc: true } }, false)).toBe(false);
    expect(corpusStateNeedsIndex({ ...plain, sort: { key: 'text', desc: false } }, false)).toBe(true);
    expect(corpusStateNeedsIndex({ ...plain, filter: { slot: 'day' } }, false)).toBe(true);
    // Blind mode ignores the disagreement filter, so it alone needs no index.
    expect(corpusStateNeedsIndex({ ...plain, filter: { disagreement: true } }, true)).toBe(false);
    expect(corpusStateNeedsIndex({ ...plain, filter: { disagreement: true } }, false)).toBe(true);
    expect(corpusFilterCount({ slot: 'day', violations: true, text: '' })).toBe(2);
  });
});
