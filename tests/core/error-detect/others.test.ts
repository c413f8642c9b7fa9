import { describe, expect, it } from 'vitest';
import {
  findingKey,
  findingsUndismissed,
  identicalFind,
  modelDisagreementsFind,
  slotOutliersFind,
  stretchesDiffering,
  type ModelComparedUtterance,
} from '../../../src/core/error-detect';
import { copies, said } from './corpus';

// Invented home-repair data; expected findings worked out by hand.
describe('identical utterances with different labels', () => {
  const corpus = [
    ...copies(2, 'bk', 'book a plumber', ['O', 'O', 'B-service'], 'book_visit'),
    said('bk-3', 'Book a plumber', ['O', 'O', 'O'], 'book_visit'),
    ...copies(3, 'pr', 'what does a boiler check cost', ['O', 'O', 'O', 'B-service', 'I-service', 'O'], 'ask_price'),
    said('pr-4', 'what does a boiler check cost', ['O', 'O', 'O', 'B-service', 'I-service', 'O'], 'check_status'),
    ...copies(2, 'ok', 'cancel my visit', ['O', 'O', 'O'], 'cancel'),
  ];

  it('reports each differing group, clearest majority first', () => {
    const findings = identicalFind(corpus);
    expect(findings.map((f) => f.tokens.join(' '))).toEqual(['what does a boiler check cost', 'book a plumber']);
    expect(findings[0]).toMatchObject({ tagsDiffer: false, intentsDiffer: true, occurrences: 4, majorityShare: 0.75 });
    expect(findings[1]).toMatchObject({ tagsDiffer: true, intentsDiffer: false, occurrences: 3 });
    expect(findings[0]?.readings[1]).toEqual({
      tags: ['O', 'O', 'O', 'B-service', 'I-service', 'O'],
      intent: 'check_status',
      locations: [{ id: 'pr-4', layer: 'lead', start: 0, end: 6 }],
    });
  });
});

describe('slot-value outliers', () => {
  const corpus = [
    ...copies(20, 'ka', 'leak in the kitchen', ['B-problem', 'O', 'O', 'B-area'], 'book_visit'),
    said('ks-1', 'the kitchen please', ['O', 'B-service', 'O'], 'book_visit'),
    ...copies(10, 'td', 'come on tuesday', ['O', 'O', 'B-day'], 'book_visit'),
    said('tw-1', 'Tuesday', ['B-time_window'], 'reschedule'),
    ...copies(3, 'sp', 'blocked sink', ['B-problem', 'I-problem'], 'book_visit'),
    said('ss-1', 'blocked sink', ['B-service', 'I-service'], 'book_visit'),
  ];

  it('reports the minority occurrences, highest ratio first', () => {
    const findings = slotOutliersFind(corpus);
    expect(findings.map((f) => [f.value, f.slot, f.majoritySlot, f.ratio])).toEqual([
      ['kitchen', 'service', 'area', 20],
      ['tuesday', 'time_window', 'day', 10],
    ]);
    expect(findings[0]?.locations).toEqual([{ id: 'ks-1', layer: 'lead', start: 1, end: 2 }]);
  });

  it('a majority of three is below the default floor but found with a lower one', () => {
    const findings = slotOutliersFind(corpus, { minRatio: 3, minMajority: 3 });
    expect(findings.map((f) => f.value)).toEqual(['kitchen', 'tuesday', 'blocked sink']);
  });
});

describe('model–annotator disagreements', () => {
  const compared = (id: string, text: string, tags: string[], modelTags: string[], confidences: number[]): ModelComparedUtterance => ({
    ...said(id, text, tags),
    modelTags,
    confidences,
  });
  const corpus = [
    compared('hr-1', 'plumber on friday evening', ['B-service', 'O', 'B-day', 'O'], ['B-service', 'O', 'B-day', 'B-time_window'], [0.99, 0.99, 0.98, 0.95]),
    compared('hr-2', 'upstairs bathroom leak', ['B-area', 'I-area', 'B-problem'], ['B-area', 'O', 'B-problem'], [0.99, 0.93, 0.99]),
    compared('hr-3', 'garden tap', ['B-area', 'B-problem'], ['B-problem', 'I-problem'], [0.6, 0.7]),
    compared('hr-4', 'call 555-0134', ['O', 'B-contact_phone'], ['O', 'B-contact_phone'], [1, 1]),
  ];

  it('keeps confident disagreements only, most confident first, merged per stretch', () => {
    const findings = modelDisagreementsFind(corpus);
    expect(findings).toEqual([
      {
        kind: 'model-disagreement',
        location: { id: 'hr-1', layer: 'lead', start: 3, end: 4 },
        tokens: ['evening'],
        annotatorTags: ['O'],
        modelTags: ['B-time_window'],
        confidence: 0.95,
      },
      {
        kind: 'model-disagreement',
        location: { id: 'hr-2', layer: 'lead', start: 0, end: 2 },
        tokens: ['upstairs', 'bathroom'],
        annotatorTags: ['B-area', 'I-area'],
        modelTags: ['B-area', 'O'],
        confidence: 0.93,
      },
    ]);
    expect(modelDisagreementsFind(corpus, { minConfidence: 0.5 }).map((f) => f.location.id)).toEqual(['hr-1', 'hr-2', 'hr-3']);
  });

  it('merges overlapping unmatched spans into one stretch', () => {
    expect(
      stretchesDiffering(
        [{ start: 0, end: 2, slot: 'area' }, { start: 4, end: 5, slot: 'day' }],
        [{ start: 1, end: 3, slot: 'area' }, { start: 4, end: 5, slot: 'day' }],
      ),
    ).toEqual([{ start: 0, end: 3 }]);
  });
});

describe('finding keys', () => {
  it('are built from content, differ per kind, and drive dismissals', () => {
    const a = copies(10, 'ka', 'kitchen', ['B-area']);
    const b = [said('x-1', 'kitchen', ['B-service'])];
    const shifted = [said('x-1', 'the kitchen', ['O', 'B-service'])];
    const outlier = slotOutliersFind([...a, ...b])[0];
    const outlierShifted = slotOutliersFind([...a, ...shifted])[0];
    if (outlier === undefined || outlierShifted === undefined) throw new Error('expected an outlier');
    // The minority span moved from token 0 to token 1: same finding, same key.
    expect(outlierShifted.locations[0]?.start).toBe(1);
    expect(findingKey(outlierShifted)).toBe(findingKey(outlier));
    const identical = identicalFind([...a, ...b])[0];
    if (identical === undefined) throw new Error('expected an identical-utterance finding');
    expect(findingKey(identical)).not.toBe(findingKey(outlier));
    expect(findingsUndismissed([outlier, identical], new Set([findingKey(outlier)]))).toEqual([identical]);
  });
});
