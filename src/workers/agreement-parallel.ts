/**
 * The bootstrap spread over threads. The core's resample stream starts any range straight at its
 * own state, so ranges resampled apart and joined in order give exactly the values of one pass
 * (see `bootstrapRange`): the intervals do not depend on the thread count.
 */
import { bootstrapRange, resampleValuesJoin, type BootstrapJob, type ResampleValues } from '../core/agreement';
import type { BootstrapRunner } from './agreement-run';

export interface BootstrapHelper {
  range(rows: BootstrapJob['rows'], layout: BootstrapJob['layout'], seed: number, from: number, to: number): Promise<ResampleValues>;
  end(): void;
}

// Progress steps of this thread's own share (as in `bootstrapHere`).
const STEP = 100;

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
      const mine: ResampleValues[] = [];
      for (let at = from; at < to; at += STEP) {
        // Every share runs at about the same pace: this one's progress stands for all.
        onProgress(Math.round(((at - from) / Math.max(1, to - from)) * job.resamples));
        mine.push(bootstrapRange(job.rows, job.layout, job.seed, at, Math.min(to, at + STEP)));
      }
      return resampleValuesJoin([...(await Promise.all(theirs)), resampleValuesJoin(mine)]);
    } finally {
      for (const h of helpers) h.end();
    }
  };
}
