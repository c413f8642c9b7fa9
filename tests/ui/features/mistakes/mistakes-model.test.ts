import { describe, expect, it } from 'vitest';
import { findingKey, identicalFind, variationFind, type LabelledUtterance, type ModelDisagreementFinding, type SlotOutlierFinding } from '../../../../src/core/error-detect';
import {
  competingReadings,
  findingGroups,
  findingHeadline,
  labelQueryOf,
  mistakesFilterFromQuery,
  mistakesFilterToQuery,
  placeContext,
  spansText,
} from '../../../../src/ui/features/mistakes/mistakes-model';
import type { FindingsScan } from '../../../../src/workers/findings-run';

const lab = (id: string, layer: string, text: string, tags: string[], intent?: string): LabelledUtterance => ({ id, layer, tokens: text.split(' '), tags, ...(intent === undefined ? {} : { intent }) });

// "on friday" after "plumber": three times a day, once a time window.
const CORPUS = [
  lab('1', 'ann-a', 'book a plumber on friday please', ['O', 'O', 'B-service', 'O', 'B-day', 'O'], 'book_visit'),
  lab('2', 'ann-a', 'book a plumber on friday please', ['O', 'O', 'B-service', 'O', 'B-day', 'O'], 'book_visit'),
  lab('3', 'ann-b', 'book a plumber on friday please', ['O', 'O', 'B-service', 'O', 'B-day', 'O'], 'book_visit'),
  lab('4', 'gold', 'Book a plumber on Friday please', ['O', 'O', 'B-service', 'O', 'B-time_window', 'O'], 'reschedule'),
  // "tap" as a problem once and as a service once, in different surroundings.
  lab('5', 'ann-a', 'fix the tap today', ['O', 'O', 'B-problem', 'B-day']),
  lab('6', 'ann-b', 'please fix the tap now', ['O', 'O', 'O', 'B-service', 'O']),
];

const OUTLIER: SlotOutlierFinding = {
  kind: 'slot-outlier',
  value: 'monday',
  slot: 'time_window',
  count: 1,
  majoritySlot: 'day',
  majorityCount: 12,
  ratio: 12,
  locations: [{ id: '9', layer: 'ann-b', start: 2, end: 3 }],
};
const MODEL: ModelDisagreementFinding = {
  kind: 'model-disagreement',
  location: { id: '9', layer: 'ann-b', start: 2, end: 3 },
  tokens: ['monday'],
  annotatorTags: ['B-time_window'],
  modelTags: ['B-day'],
  confidence: 0.9731,
};

function scanOf(): FindingsScan {
  const findings = [...variationFind(CORPUS), ...identicalFind(CORPUS), OUTLIER, MODEL];
  return {
    projectId: 1,
    layersChecked: 5,
    utterancesChecked: 5,
    fromGold: 1,
    fromPeople: 4,
    findings: findings.map((finding) => ({ key: findingKey(finding), finding })),
    sameUtteranceDropped: 0,
    model: { kind: 'used', saved: 0, origin: 'trained' },
    utterances: { '9': { seq: 9, words: ['call', 'me', 'monday'] } },
  };
}

describe('mistakes filter in the URL', () => {
  it('reads the kind and the dismissed switch, defaulting anything unknown, and keeps other keys', () => {
    expect(mistakesFilterFromQuery({})).toEqual({ kind: 'all', showDismissed: false });
    expect(mistakesFilterFromQuery({ kind: 'identical', dismissed: 'shown' })).toEqual({ kind: 'identical', showDismissed: true });
    expect(mistakesFilterFromQuery({ kind: 'typo', dismissed: 'yes' })).toEqual({ kind: 'all', showDismissed: false });
    expect(mistakesFilterToQuery({ kind: 'slot-outlier', showDismissed: true }, { other: 'x', kind: 'variation' })).toEqual({ other: 'x', kind: 'slot-outlier', dismissed: 'shown' });
    expect(mistakesFilterToQuery({ kind: 'all', showDismissed: false }, { kind: 'variation', dismissed: 'shown' })).toEqual({});
    for (const filter of [
      { kind: 'model-disagreement', showDismissed: false },
      { kind: 'all', showDismissed: true },
    ] as const) {
      expect(mistakesFilterFromQuery(mistakesFilterToQuery(filter))).toEqual(filter);
    }
  });
});

describe('findingGroups', () => {
  it('groups by kind in the screen order, keeps the core rank, hides dismissed ones unless asked', () => {
    const scan = scanOf();
    const variationKeys = scan.findings.filter((f) => f.finding.kind === 'variation').map((f) => f.key);
    expect(variationKeys.length).toBeGreaterThan(1);
    const dismissed = new Set([variationKeys[0] as string]);

    const groups = findingGroups(scan, dismissed, { kind: 'all', showDismissed: false });
    expect(groups.map((g) => g.kind)).toEqual(['variation', 'identical', 'slot-outlier', 'model-disagreement']);
    const variation = groups[0]!;
    expect(variation.total).toBe(variationKeys.length);
    expect(variation.dismissed).toBe(1);
    expect(variation.items.map((i) => i.key)).toEqual(variationKeys.slice(1));
    expect(variation.items.map((i) => i.rank)).toEqual(variationKeys.slice(1).map((_, i) => i + 2));

    const all = findingGroups(scan, dismissed, { kind: 'variation', showDismissed: true });
    expect(all).toHaveLength(1);
    expect(all[0]?.items.map((i) => [i.rank, i.dismissed])).toEqual(variationKeys.map((_, i) => [i + 1, i === 0]));
  });
});

describe('competing labels in words', () => {
  it('names slots with their words', () => {
    expect(spansText(['a', 'plumber', 'on', 'friday'], ['O', 'B-service', 'O', 'B-day'])).toBe('service “plumber”, day “friday”');
    expect(spansText(['north', 'end'], ['B-area', 'I-area'])).toBe('area “north end”');
    expect(spansText(['hello'], ['O'])).toBe('no slot');
  });

  it('variation: the varying words in brackets, majority reading first with its count', () => {
    const finding = variationFind(CORPUS).find((f) => f.tokens.join(' ') === 'book a plumber on friday please');
    expect(finding).toBeDefined();
    expect(findingHeadline(finding!)).toBe('book a plumber on [friday] please');
    expect(competingReadings(finding!).map((r) => [r.label, r.count])).toEqual([
      ['day “friday” (tags B-day)', 3],
      ['time_window “friday” (tags B-time_window)', 1],
    ]);
  });

  it('identical: slots and intent per reading', () => {
    const [finding] = identicalFind(CORPUS);
    expect(competingReadings(finding!).map((r) => [r.label, r.count, r.places.length])).toEqual([
      ['service “plumber”, day “friday”; intent book_visit', 3, 3],
      ['service “plumber”, time_window “friday”; intent reschedule', 1, 1],
    ]);
  });

  it('slot outlier and model disagreement: both sides with their counts, places only on the doubtful side', () => {
    expect(competingReadings(OUTLIER).map((r) => [r.label, r.count, r.places.length])).toEqual([
      ['slot day', 12, 0],
      ['slot time_window', 1, 1],
    ]);
    expect(competingReadings(MODEL).map((r) => [r.label, r.count, r.places.length])).toEqual([
      ['the model: day “monday” (at least 97 % sure)', 1, 0],
      ['ann-b: time_window “monday”', 1, 1],
    ]);
    expect(findingHeadline(OUTLIER)).toBe('monday');
  });
});

describe('places', () => {
  it('shows words around the place, with an ellipsis where words are left out', () => {
    const utterance = { seq: 3, words: 'hi could you send someone to north end on friday morning please'.split(' ') };
    expect(placeContext(utterance, { id: '3', layer: 'ann-a', start: 6, end: 8 }, 2)).toEqual({ before: '… someone to', focus: 'north end', after: 'on friday …' });
    expect(placeContext(utterance, { id: '3', layer: 'ann-a', start: 0, end: 1 }, 20)).toEqual({ before: '', focus: 'hi', after: utterance.words.slice(1).join(' ') });
  });

  it('opens the gold layer for gold places, the utterance alone otherwise', () => {
    expect(labelQueryOf({ id: '12', layer: 'gold', start: 0, end: 1 })).toEqual({ u: '12', layer: 'gold' });
    expect(labelQueryOf({ id: '12', layer: 'ann-a', start: 0, end: 1 })).toEqual({ u: '12' });
  });
});
