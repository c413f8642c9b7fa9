import { describe, expect, it } from 'vitest';
import { assignmentPlan } from '../../../../src/core/exchange';
import { annotatorIdsParse, layersFileName, mergeSummaryText, overlapParse, packFileName, previewRows, wholeParse } from '../../../../src/ui/features/team/team-form';

describe('team form', () => {
  it('reads annotator ids, refusing reserved names', () => {
    expect(annotatorIdsParse(' ana, ben  chloe,ana ')).toEqual({ ids: ['ana', 'ben', 'chloe'], problem: null });
    expect(annotatorIdsParse('ana, gold').problem).toMatch(/reserved/);
    expect(annotatorIdsParse('  ').problem).toMatch(/at least one/);
  });

  it('reads the overlap percentage and whole numbers', () => {
    expect(overlapParse('20')).toBe(0.2);
    expect(overlapParse('12.5')).toBe(0.125);
    expect(overlapParse('101')).toBeNull();
    expect(overlapParse('-5')).toBeNull();
    expect(overlapParse('ten')).toBeNull();
    expect(wholeParse('4294967295')).toBe(4294967295);
    expect(wholeParse('4294967296')).toBeNull();
    expect(wholeParse('3.5')).toBeNull();
  });

  it('counts each annotator’s utterances and shared ones for the preview', () => {
    const plan = assignmentPlan(Array.from({ length: 10 }, (_, i) => i + 1), ['ana', 'ben'], 0.2, 5);
    // Two annotators, 2 doubles: 12 slots, 6 each, both share the same 2.
    expect(previewRows(plan)).toEqual([
      { annotator: 'ana', total: 6, shared: 2 },
      { annotator: 'ben', total: 6, shared: 2 },
    ]);
  });

  it('names files safely and sums up a merge', () => {
    expect(packFileName('Boiler: jobs', 'ana')).toBe('Boiler_ jobs-pack-ana.slotsmith-pack.jsonl');
    expect(layersFileName('Boiler jobs', 'ben')).toBe('Boiler jobs-layers-ben.slotsmith-layers.jsonl');
    const text = mergeSummaryText({ annotator: 'ana', received: 4, done: 3, skipped: 1, added: 1, replaced: 2, unchanged: 1, older: [5], conflicts: [], newDisagreements: 0 });
    expect(text).toBe('Merged ana’s layers: 1 new layer, 2 newer revisions, 1 unchanged, 1 older layer ignored (lines 5).');
  });
});
