import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { exportSelect, LAYER_STATUSES, type LayerPolicy, type LayerStatus } from '../../../src/core/export';
import { itemMake, layerMake } from './items';

// "book a plumber friday" → 4 word tokens.
const TEXT = 'book a plumber friday';
const A_TAGS = ['O', 'O', 'B-service', 'B-day'];
const GOLD_TAGS = ['O', 'O', 'B-service', 'O'];

const corpus = [
  itemMake('hr-1', TEXT, [layerMake('gold', 'done', GOLD_TAGS, 'book_visit'), layerMake('ann-a', 'done', A_TAGS, 'reschedule')]),
  itemMake('hr-2', TEXT, [layerMake('gold', 'draft', GOLD_TAGS, 'book_visit'), layerMake('ann-a', 'done', A_TAGS, 'book_visit')]),
  itemMake('hr-3', TEXT, [layerMake('ann-a', 'flagged', A_TAGS)]),
  itemMake('hr-4', TEXT, [layerMake('ann-b', 'done', A_TAGS)]),
  itemMake('hr-5', TEXT, []),
];

describe('exportSelect', () => {
  it('gold: only gold layers that are done; a gold draft is left out by status', () => {
    const s = exportSelect(corpus, { policy: { kind: 'gold' } });
    expect(s.utterances.map((u) => u.id)).toEqual(['hr-1']);
    expect(s.utterances[0]).toMatchObject({ text: TEXT, tags: GOLD_TAGS, intent: 'book_visit', meta: {} });
    expect(s.annotators).toEqual(['gold']);
    expect(s.report).toMatchObject({ total: 5, kept: 1, missingLayer: 3 });
    expect(s.report.filteredByStatus.draft).toBe(1);
  });

  it('one annotator: their done layers, with their own intent', () => {
    const s = exportSelect(corpus, { policy: { kind: 'annotator', annotator: 'ann-a' } });
    expect(s.utterances.map((u) => [u.id, u.intent])).toEqual([
      ['hr-1', 'reschedule'],
      ['hr-2', 'book_visit'],
    ]);
    expect(s.report).toMatchObject({ kept: 2, missingLayer: 2 });
    expect(s.report.filteredByStatus.flagged).toBe(1);
  });

  it('gold, else an annotator: gold where it is done, the annotator where gold is not', () => {
    const s = exportSelect(corpus, { policy: { kind: 'gold-else', annotator: 'ann-a' } });
    expect(s.utterances.map((u) => u.id)).toEqual(['hr-1', 'hr-2']);
    expect(s.annotators).toEqual(['gold', 'ann-a']);
    expect(s.utterances[1]?.tags).toEqual(A_TAGS);
    expect(s.report).toMatchObject({ kept: 2, missingLayer: 2 });
    expect(s.report.filteredByStatus.flagged).toBe(1);
  });

  it('a wider status filter takes drafts and flagged layers too', () => {
    const s = exportSelect(corpus, { policy: { kind: 'gold-else', annotator: 'ann-a' }, statuses: ['done', 'draft', 'flagged'] });
    // hr-2: gold is a draft, which is now allowed, so gold wins over ann-a's done layer.
    expect(s.utterances.map((u) => u.id)).toEqual(['hr-1', 'hr-2', 'hr-3']);
    expect(s.annotators).toEqual(['gold', 'gold', 'ann-a']);
  });

  it('reads a null intent (as the storage layer keeps it) as no intent', () => {
    const item = itemMake('hr-8', TEXT, [{ annotator: 'gold', status: 'done', tags: GOLD_TAGS, intent: null }]);
    const [u] = exportSelect([item], { policy: { kind: 'gold' } }).utterances;
    expect(u).toBeDefined();
    expect(u && 'intent' in u).toBe(false);
  });

  it('copies utterance fields, so later edits to the selection do not reach the source', () => {
    const item = itemMake('hr-9', TEXT, [layerMake('gold', 'done', [...GOLD_TAGS])]);
    const s = exportSelect([item], { policy: { kind: 'gold' } });
    s.utterances[0]?.tags.fill('O');
    expect(item.layers[0]?.tags).toEqual(GOLD_TAGS);
  });

  it('accounts for every utterance and follows the policy order (property, against a direct reading)', () => {
    const annotators = ['gold', 'ann-a', 'ann-b'];
    const layerArb = fc.record({ annotator: fc.constantFrom(...annotators), status: fc.constantFrom(...LAYER_STATUSES) });
    const layersArb = fc.uniqueArray(layerArb, { selector: (l) => l.annotator, maxLength: 3 });
    const policyArb: fc.Arbitrary<LayerPolicy> = fc.oneof(
      fc.constant({ kind: 'gold' as const }),
      fc.constantFrom('ann-a', 'ann-b').map((annotator) => ({ kind: 'annotator' as const, annotator })),
      fc.constantFrom('ann-a', 'ann-b').map((annotator) => ({ kind: 'gold-else' as const, annotator })),
    );
    fc.assert(
      fc.property(fc.array(layersArb, { maxLength: 20 }), policyArb, fc.subarray([...LAYER_STATUSES]), (all, policy, statuses) => {
        const items = all.map((layers, i) => itemMake(`hr-${i}`, TEXT, layers.map((l) => layerMake(l.annotator, l.status as LayerStatus, A_TAGS))));
        const s = exportSelect(items, { policy, statuses });
        const { report } = s;
        const filtered = Object.values(report.filteredByStatus).reduce((a, b) => a + b, 0);
        expect(report.kept + report.missingLayer + filtered).toBe(items.length);
        expect(s.utterances).toHaveLength(report.kept);
        const wanted = policy.kind === 'gold' ? ['gold'] : policy.kind === 'annotator' ? [policy.annotator] : ['gold', policy.annotator];
        const expected = items.flatMap((item) => {
          const chosen = wanted.map((a) => item.layers.find((l) => l.annotator === a)).find((l) => l !== undefined && statuses.includes(l.status));
          return chosen === undefined ? [] : [[item.id, chosen.annotator]];
        });
        expect(s.utterances.map((u, i) => [u.id, s.annotators[i]])).toEqual(expected);
      }),
      { seed: 42, numRuns: 300 },
    );
  });
});
