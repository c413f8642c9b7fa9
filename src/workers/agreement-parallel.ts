/**
 * The bootstrap spread over threads. The core's resample stream starts any range straight at its
 * own state, so ranges resampled apart and joined in order give exactly the totals of one pass
 * (see `bootstrapTotalsRange`): the intervals do not depend on the thread count.
 */
import { bootstrapPatchRange, bootstrapTotalsRange, totalsAdd, type BootstrapJob, type BootstrapPatchPlan } from '../core/agreement';
import type { BootstrapRunner } from './agreement-run';

export interface BootstrapHelper {
  /** Totals of resamples [from, to), `layout.width` per resample. */
  range(rows: BootstrapJob['rows'], layout: BootstrapJob['layout'], seed: number, from: number, to: number): Promise<Float64Array>;
  /** How totals of resamples [from, to) change under `plan` (core `bootstrapPatchRange`). */
  patch(plan: BootstrapPatchPlan, from: number, to: number): Promise<Float64Array>;
  end(): void;
}

// Progress steps of this thread's own share: a few calls, as each sorts the rows by column and copies them into WebAssembly memory again.
const STEP = 250;

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

/** [from, to) of each share of `resamples`: helpers take the first ones, this thread the last. */
function shareBounds(resamples: number, shares: number): (readonly [number, number])[] {
  const size = Math.ceil(resamples / shares);
  return Array.from({ length: shares }, (_, k) => [Math.min(resamples, k * size), Math.min(resamples, (k + 1) * size)] as const);
}

/** Kept totals brought up to date under `plan`, the replay spread over threads (as the bootstrap itself). */
export type BootstrapPatchRunner = (plan: BootstrapPatchPlan, kept: Float64Array, onProgress: (done: number) => void) => Promise<Float64Array>;

export function bootstrapPatchParallel(helpersStart: () => BootstrapHelper[]): BootstrapPatchRunner {
  return async (plan, kept, onProgress) => {
    const resamples = kept.length / plan.width;
    const totals = kept.slice();
    if (plan.positions.length === 0) return totals;
    const helpers = helpersStart();
    try {
      const bounds = shareBounds(resamples, helpers.length + 1);
      const theirs = helpers.map((h, k) => h.patch(plan, bounds[k]?.[0] ?? 0, bounds[k]?.[1] ?? 0));
      const [from, to] = bounds[helpers.length] ?? [0, 0];
      for (let at = from; at < to; at += STEP) {
        onProgress(Math.round(((at - from) / Math.max(1, to - from)) * resamples));
        totalsAdd(totals, bootstrapPatchRange(plan, at, Math.min(to, at + STEP)), at, plan.width);
      }
      (await Promise.all(theirs)).forEach((change, k) => totalsAdd(totals, change, bounds[k]?.[0] ?? 0, plan.width));
      return totals;
    } finally {
      for (const h of helpers) h.end();
    }
  };
}

/** Helpers take the first shares, this thread the last one in steps (reporting progress); all are ended after. */
export function bootstrapParallel(helpersStart: () => BootstrapHelper[]): BootstrapRunner {
  return async (job, onProgress) => {
    const helpers = helpersStart();
    try {
      const shares = helpers.length + 1;
      const bounds = shareBounds(job.resamples, shares);
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
