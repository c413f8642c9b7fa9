import { describe, expect, it } from 'vitest';
import type { OverviewResult } from '../../../../src/workers/agreement-overview';
import { distributionStatuses, overviewSourceOf, peopleLayers, progressTableRows } from '../../../../src/ui/features/overview/overview-model';

const statuses = (done: number, draft = 0) => ({ unlabelled: 0, draft, done, skipped: 0, flagged: 0 });
const result: OverviewResult = {
  utterances: 10,
  annotators: [
    { annotator: 'ana-p', statuses: statuses(6, 2), doneByDay: [] },
    { annotator: 'gold', statuses: statuses(3), doneByDay: [] },
  ],
  slots: [],
  intents: [],
  countedLayers: 6,
  headline: { people: 1, layers: 11, doneLayers: 6, overlapDone: 0, goldLayers: 3, untouched: 2 },
};

describe('overview model', () => {
  it('counts people’s layers only and lays out the status table in status order', () => {
    expect(peopleLayers(result)).toBe(8);
    expect(progressTableRows(result)).toEqual([
      { annotator: 'ana-p', counts: [0, 2, 6, 0, 0] },
      { annotator: 'gold', counts: [0, 0, 3, 0, 0] },
    ]);
  });

  it('reads the source and statuses from the URL', () => {
    expect(overviewSourceOf('gold', ['ana-p', 'gold'])).toBe('gold');
    expect(overviewSourceOf('nobody', ['ana-p'])).toBeNull();
    expect(overviewSourceOf(undefined, ['ana-p'])).toBeNull();
    expect(distributionStatuses(false)).toEqual(['done']);
    expect(distributionStatuses(true)).toEqual(['done', 'draft']);
  });
});
