/**
 * The bootstrap spread over threads. The core's resample stream starts any range straight at its
 * own state, so ranges resampled apart and joined in order give exactly the totals of one pass
 * (see `bootstrapTotalsRange`): the intervals do not depend on the thread count.
 */
import { bootstrapTotalsRange, type BootstrapJob } from '../core/agreement';
import type { BootstrapRunner } from './agreement-run';

export interface BootstrapHelper {
  /** Totals of resamples [from, to), `layout.width` per resample. */
  range(rows: BootstrapJob['rows'], layout: BootstrapJob['layout'], seed: number, from: number, to: number): Promise<Float64Array>;
  end(): void;
}

// Progress steps of this thread's own share (as in `bootstrapHere`).
const STEP = 100;

/** Ranges of resample totals joined in order. */
export function totalsJoin(parts: readonly Float64Array[]): Float64Array {
  const joined = new Float64Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const part of parts) {
    joined.set(part, at);
    at += part.length;
  }
  return joined;
}

/** Helpers take the first shares, this thread the last one in steps (reporting progress); all are ended after. */
export function bootstrapParallel(helpersStart: () => BootstrapHelper[]): BootstrapRunner {
  return async (job, onProgress) => {
    const helpers = helpersStart();
    try {
      const shares = helpers.length + 1;
      const size = Math.ceil(job.resamples / shares);
      const bounds = Array.from({ length: shares }, (_, k) => [Math.min(job.resamples, k * size), Math.min(job.resamples, (k + 1) * size)] as const);
      const theirs = helpers.map((h, k) => h.range(job.rows, job.layout, job.seed, bounds[k]?.[0] ?? 0, bounds[k]?.[1] ?? 0));
      const [from, to] = bounds[shares - 1] ?? [0, 0];
      const mine: Float64Array[] = [];
      for (let at = from; at < to; at += STEP) {
        // Every share runs at about the same pace: this one's progress stands for all.
        onProgress(Math.round(((at - from) / Math.max(1, to - from)) * job.resamples));
        mine.push(bootstrapTotalsRange(job.rows, job.layout, job.seed, at, Math.min(to, at + STEP)));
      }
      return totalsJoin([...(await Promise.all(theirs)), ...mine]);
    } finally {
      for (const h of helpers) h.end();
    }
  };
}
