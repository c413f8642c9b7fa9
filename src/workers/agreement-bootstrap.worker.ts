/** A helper thread of the agreement worker: one contiguous range of bootstrap resamples (the core's stream is splittable). */
import * as Comlink from 'comlink';
import { bootstrapRange, type BootstrapJob, type ResampleValues } from '../core/agreement';

const api = {
  range(rows: BootstrapJob['rows'], layout: BootstrapJob['layout'], seed: number, from: number, to: number): ResampleValues {
    return bootstrapRange(rows, layout, seed, from, to);
  },
};

export type AgreementBootstrapApi = typeof api;

Comlink.expose(api);
