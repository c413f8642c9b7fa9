import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LAYER_STATUSES, type LayerStatus } from '../../src/core/backup/model';
import { LayerCopyBuilder, type LayerCopy } from '../../src/db/layer-copy';
import { gatheredAlign, gatheredFromCopy, updatedByPosition } from '../../src/workers/agreement-gather';
import { copiesAlign } from '../../src/workers/copies-align';

const SIGNATURE = { project: 'p', batches: '[]', historyLast: 0 };

// Tags of any scheme, illegal sequences and unparseable strings included: stored tags are kept as imported.
const tag = fc.constantFrom('O', 'B-day', 'I-day', 'E-day', 'S-day', 'B-area.from', 'I-area.from', 'I-budget', 'B-Zone', 'L-x', 'weird', '');
const statusChoice = fc.subarray([...LAYER_STATUSES], { minLength: 1 });

/** Utterances 1..60 with a fixed token count each (as the database keeps them: every layer of one utterance has as many tags). */
const corpus = fc.array(fc.integer({ min: 0, max: 6 }), { minLength: 60, maxLength: 60 });

function layersOf(lengths: readonly number[]) {
  return fc.uniqueArray(fc.integer({ min: 1, max: lengths.length }), { maxLength: 40 }).chain((ids) =>
    fc.tuple(
      ...ids.map((id) =>
        fc.record({
          id: fc.constant(id),
          tags: fc.array(tag, { minLength: lengths[id - 1] ?? 0, maxLength: lengths[id - 1] ?? 0 }),
          intent: fc.option(fc.constantFrom('book_visit', 'reschedule', 'cancel', 'Ask'), { nil: null }),
          status: fc.constantFrom(...LAYER_STATUSES),
          updated: fc.integer({ min: 0, max: 2e12 }),
        }),
      ),
    ),
  );
}

function copyOf(annotator: string, rows: readonly { id: number; tags: string[]; intent: string | null; status: LayerStatus; updated: number }[]): LayerCopy {
  const builder = new LayerCopyBuilder(1, annotator);
  for (const row of [...rows].sort((x, y) => x.id - y.id)) builder.rowAdd({ utteranceId: row.id, tags: row.tags, intent: row.intent, status: row.status, updated: row.updated });
  return builder.done(SIGNATURE);
}

describe('copiesAlign', () => {
  it('gives the corpus, counts and times of the gathered path for two to four copies (fast-check)', () => {
    fc.assert(
      fc.property(
        corpus.chain((lengths) => fc.tuple(fc.array(layersOf(lengths), { minLength: 2, maxLength: 4 }), statusChoice)),
        ([layers, statuses]) => {
          const copies = layers.map((rows, i) => copyOf(`ann-${String.fromCharCode(97 + i)}`, rows));
          const gathered = copies.map((c) => gatheredFromCopy(c, statuses));
          const general = gatheredAlign(gathered);
          const direct = copiesAlign(copies, statuses);
          expect(general.ok).toBe(true);
          if (!general.ok || direct === null) throw new Error('both paths must align');
          expect(direct.corpus).toEqual(general.corpus);
          expect(direct.updated).toEqual(updatedByPosition(general.corpus.ids, gathered));
          expect(direct.counted).toEqual(gathered.map((g) => ({ annotator: g.annotator, layers: g.data.count, statuses: g.statuses })));
        },
      ),
      { seed: 7, numRuns: 300 },
    );
  });

  it('puts utterances only a later layer has after the first layer’s, in that layer’s order', () => {
    const a = copyOf('ann-a', [
      { id: 3, tags: ['O'], intent: null, status: 'done', updated: 1 },
      { id: 5, tags: ['B-day'], intent: null, status: 'done', updated: 2 },
    ]);
    const b = copyOf('ann-b', [
      { id: 2, tags: ['O', 'O'], intent: 'cancel', status: 'done', updated: 3 },
      { id: 5, tags: ['I-day'], intent: null, status: 'done', updated: 4 },
      { id: 9, tags: [], intent: null, status: 'done', updated: 5 },
    ]);
    const got = copiesAlign([a, b], ['done']);
    expect(got?.corpus.ids).toEqual(['3', '5', '2', '9']);
    expect([...(got?.corpus.offsets ?? [])]).toEqual([0, 1, 2, 4, 4]);
    // A stray I-day reads as B-day (CoNLL-2000): both layers mark the same span. B-day = 1 over slots O, day.
    expect([...(got?.corpus.tags[1] ?? [])]).toEqual([-1, 1, 0, 0]);
    expect(got?.updated.map((t) => [...t])).toEqual([
      [1, 2, Number.NaN, Number.NaN],
      [Number.NaN, 4, 3, 5],
    ]);
  });

  it('gives way (null) when two layers of one utterance have different token counts, so the general path words the error', () => {
    const a = copyOf('ann-a', [{ id: 1, tags: ['O', 'O'], intent: null, status: 'done', updated: 0 }]);
    const b = copyOf('ann-b', [{ id: 1, tags: ['O'], intent: null, status: 'done', updated: 0 }]);
    expect(copiesAlign([a, b], ['done'])).toBeNull();
    const general = gatheredAlign([a, b].map((c) => gatheredFromCopy(c, ['done'])));
    expect(general.ok).toBe(false);
  });
});
