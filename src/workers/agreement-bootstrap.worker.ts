/** A helper thread of the agreement worker: one contiguous range of bootstrap resamples (the core's stream is splittable). */
import * as Comlink from 'comlink';
import { bootstrapPatchRange, bootstrapTotalsRange, type BootstrapJob, type BootstrapPatchPlan } from '../core/agreement';
import { bootstrapWarm } from './bootstrap-warm';

// Started ahead of need (with the agreement worker): the first real range then runs optimised code.
bootstrapWarm();

const api = {
  /** Totals of resamples [from, to), handed over without a copy. */
  range(rows: BootstrapJob['rows'], layout: BootstrapJob['layout'], seed: number, from: number, to: number): Float64Array {
    const totals = bootstrapTotalsRange(rows, layout, seed, from, to);
    return Comlink.transfer(totals, [totals.buffer]);
  },
  /** How the totals of resamples [from, to) change under `plan`, handed over without a copy. */
  patch(plan: BootstrapPatchPlan, from: number, to: number): Float64Array {
    const change = bootstrapPatchRange(plan, from, to);
    return Comlink.transfer(change, [change.buffer]);
  },
};

export type AgreementBootstrapApi = typeof api;

Comlink.expose(api);
