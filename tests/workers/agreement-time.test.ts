import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { completionOrder } from '../../src/workers/agreement-time';

/** The plain definition: positions sorted by time, ties by position (common practice, no source). */
const byComparator = (done: number[]) => Array.from(done.keys()).sort((x, y) => (done[x] ?? 0) - (done[y] ?? 0) || x - y);

describe('completionOrder', () => {
  it('sorts by time then position, as a comparator sort does (fast-check)', () => {
    const times = fc.oneof(
      // Many ties (layers finished on the same few days), the case the packed keys must keep in position order.
      fc.array(fc.constantFrom(1_736_150_400_000, 1_736_236_800_000, 1_736_323_200_000), { maxLength: 300 }),
      fc.array(fc.integer({ min: 1_700_000_000_000, max: 1_800_000_000_000 }), { maxLength: 300 }),
      // Spans too wide for exact packed keys, and times that are not integers: the comparator path.
      fc.array(fc.oneof(fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }), fc.double({ noNaN: true, min: 0, max: 1e13 })), { maxLength: 100 }),
    );
    fc.assert(
      fc.property(times, (done) => {
        expect([...completionOrder(done)]).toEqual(byComparator(done));
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});
