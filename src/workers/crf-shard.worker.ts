/** A helper thread of the CRF training worker: holds some of the training's shards and computes their part of each evaluation. */
import * as Comlink from 'comlink';
import { type CrfShardData, crfShardService } from '../core/crf';

const service = crfShardService();

const api = {
  load(shards: CrfShardData[]): void {
    service.load(shards);
  },
  evaluate(weights: Float64Array) {
    const values = service.evaluate(weights);
    return Comlink.transfer(
      values,
      values.map((v) => v.expected.buffer as ArrayBuffer),
    );
  },
};

export type CrfShardWorkerApi = typeof api;

Comlink.expose(api);
