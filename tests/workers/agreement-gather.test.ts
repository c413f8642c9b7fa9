import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LAYER_STATUSES, type LayerStatus } from '../../src/core/backup/model';
import { LayerCopyBuilder, layerCopiesVisit } from '../../src/db/layer-copy';
import { gatheredFromCopy, LayerGathering } from '../../src/workers/agreement-gather';

const SIGNATURE = { project: 'p', batches: '[]', historyLast: 0 };

// Tags of any scheme, illegal sequences and unparseable strings included: stored tags are kept as imported.
const tag = fc.constantFrom('O', 'B-day', 'I-day', 'E-day', 'S-day', 'B-area.from', 'I-area.from', 'I-budget', 'L-x', 'weird', '');
const layer = fc.record({
  tags: fc.array(tag, { maxLength: 8 }),
  intent: fc.option(fc.constantFrom('book_visit', 'reschedule', 'cancel'), { nil: null }),
  status: fc.constantFrom(...LAYER_STATUSES),
  updated: fc.integer({ min: 0, max: 2e12 }),
});
const layers = fc.uniqueArray(fc.tuple(fc.integer({ min: 1, max: 500 }), layer), { selector: ([id]) => id, maxLength: 40 });
const statusChoice = fc.subarray([...LAYER_STATUSES], { minLength: 1 });

describe('gatheredFromCopy', () => {
  it('gives exactly what the row-by-row gatherer gives for the copy’s rows (fast-check)', () => {
    fc.assert(
      fc.property(layers, statusChoice, (rows, statuses: LayerStatus[]) => {
        const builder = new LayerCopyBuilder(1, 'ann-a');
        for (const [id, row] of [...rows].sort(([x], [y]) => x - y)) builder.rowAdd({ utteranceId: id, ...row });
        const copy = builder.done(SIGNATURE);
        const gathering = new LayerGathering(['ann-a']);
        layerCopiesVisit([copy], statuses, (row) => gathering.rowAdd(row));
        expect(gatheredFromCopy(copy, statuses)).toEqual(gathering.done()[0]);
      }),
      { seed: 42, numRuns: 400 },
    );
  });

  it('numbers slots in the order the chosen layers first use them, not the copy’s table order', () => {
    const builder = new LayerCopyBuilder(1, 'ann-a');
    builder.rowAdd({ utteranceId: 1, tags: ['B-budget'], intent: null, status: 'draft', updated: 0 });
    builder.rowAdd({ utteranceId: 2, tags: ['O', 'B-day', 'I-day'], intent: 'cancel', status: 'done', updated: 0 });
    const got = gatheredFromCopy(builder.done(SIGNATURE), ['done']);
    expect(got.data.slotNames).toEqual(['day']);
    // B-day = 2·1 − 1, I-day = 2·1 (the core's IOB2 codes).
    expect([...got.data.tags]).toEqual([0, 1, 2]);
    expect(got.data.intentNames).toEqual(['cancel']);
    expect(got.statuses).toEqual({ done: 1 });
  });
});
