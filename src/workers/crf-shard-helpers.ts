/** The CRF training worker's helper threads (nested Web Workers, which Chromium supports), one per further core. */
import * as Comlink from 'comlink';
import { CRF_SHARDS, type CrfShardHelper } from '../core/crf';
import type { CrfShardWorkerApi } from './crf-shard.worker';
import { workerCrashed } from './worker-job';

export interface CrfHelpers {
  helpers: readonly CrfShardHelper[];
  end(): void;
}

/**
 * One helper per further core, at most CRF_SHARDS − 1 (a helper holds whole shards); the training
 * worker's own thread computes its share too. A helper that fails to load or crashes rejects its
 * requests (its error event), and the training computes its shards itself, with the same result.
 */
export function crfHelpersStart(cores = typeof navigator === 'undefined' ? 1 : (navigator.hardwareConcurrency ?? 1)): CrfHelpers {
  const count = Math.max(0, Math.min(CRF_SHARDS, cores) - 1);
  const links = Array.from({ length: count }, () => {
    const worker = new Worker(new URL('./crf-shard.worker.ts', import.meta.url), { type: 'module' });
    const api = Comlink.wrap<CrfShardWorkerApi>(worker);
    const crashed = workerCrashed(worker, 'training helper');
    crashed.catch(() => undefined);
    const helper: CrfShardHelper = {
      load: (shards) => Promise.race([api.load(shards), crashed]),
      evaluate: (weights) => Promise.race([api.evaluate(weights), crashed]),
    };
    return { helper, end: () => (api[Comlink.releaseProxy](), worker.terminate()) };
  });
  return {
    helpers: links.map((l) => l.helper),
    end: () => {
      for (const l of links) l.end();
    },
  };
}
