import { availableParallelism } from 'node:os';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { CRF_SHARDS, type CrfShardData, type CrfShardHelper, crfShardService, type CrfShardValue } from '../core/crf';

/**
 * Helper threads for CRF training in Node (`train`, the bench): each holds some of the training's
 * shards and computes their part of every evaluation (see CrfThreadedObjective). The worker runs
 * this same module file (the CLI bundle, or the TypeScript source under tsx), recognised by its
 * `workerData` marker. The weights do not depend on how many run.
 */
const WORKER_MARK = 'slotsmith-crf-shard-worker';

type Request = { kind: 'load'; shards: CrfShardData[] } | { kind: 'evaluate'; weights: Float64Array };

if (!isMainThread && (workerData as { mark?: string } | null)?.mark === WORKER_MARK) {
  const service = crfShardService();
  parentPort?.on('message', (request: Request) => {
    if (request.kind === 'load') {
      service.load(request.shards);
      parentPort?.postMessage(null);
    } else {
      const values = service.evaluate(request.weights);
      parentPort?.postMessage(values, values.map((v) => v.expected.buffer as ArrayBuffer));
    }
  });
}

/** Below this many tokens an evaluation takes a few milliseconds: a thread (~50 ms to start) would cost more than it saves (measured, see bench/crf.ts). */
export const CRF_THREADS_FROM_TOKENS = 5000;

/**
 * Helper threads beside the main thread: `asked` (SLOTSMITH_WORKERS) when set (0 = none), else one
 * fewer than the CPUs once the training set reaches CRF_THREADS_FROM_TOKENS; never more than
 * CRF_SHARDS − 1, since a thread holds whole shards.
 */
export function crfThreadsChoose(asked: string | undefined, cpus: number, tokens: number): number {
  if (asked !== undefined && asked !== '') return /^\d+$/.test(asked) ? Math.min(Number(asked), CRF_SHARDS - 1) : 0;
  return tokens >= CRF_THREADS_FROM_TOKENS ? Math.max(0, Math.min(cpus, CRF_SHARDS) - 1) : 0;
}

export function crfHelperCount(tokens: number): number {
  return crfThreadsChoose(process.env.SLOTSMITH_WORKERS, availableParallelism(), tokens);
}

export interface CrfNodeHelper extends CrfShardHelper {
  /** Evaluations this thread has answered (0 when it never started). */
  readonly answered: number;
  end(): Promise<void>;
}

/** A worker on `moduleUrl`; TypeScript sources (the bench, tests) go through tsx's loader, which a worker does not inherit from its parent. */
function workerStart(moduleUrl: URL): Worker {
  const options = { workerData: { mark: WORKER_MARK } };
  if (!moduleUrl.pathname.endsWith('.ts')) return new Worker(moduleUrl, options);
  const bootstrap = `import('tsx/esm/api').then((tsx) => { tsx.register(); return import(${JSON.stringify(moduleUrl.href)}); })`;
  return new Worker(bootstrap, { ...options, eval: true });
}

/**
 * One helper thread running `moduleUrl` (this file: the CLI bundle, or the TypeScript source). A
 * thread that cannot start or dies fails its pending and later requests, and the training
 * computes its shards on the main thread instead.
 */
export function crfNodeHelperStart(moduleUrl = new URL(import.meta.url)): CrfNodeHelper {
  const worker = workerStart(moduleUrl);
  let failure: Error | null = null;
  let pending: { resolve: (reply: unknown) => void; reject: (error: Error) => void } | null = null;
  const fail = (error: Error): void => {
    failure ??= error;
    pending?.reject(error);
    pending = null;
  };
  worker.on('error', fail);
  worker.on('exit', (code) => fail(new Error(`crf helper thread exited (${code})`)));
  worker.on('message', (reply: unknown) => {
    const waiting = pending;
    pending = null;
    waiting?.resolve(reply);
  });
  const ask = <T>(request: Request): Promise<T> =>
    new Promise<T>((resolve, reject) => {
      if (failure !== null) return reject(failure);
      if (pending !== null) return reject(new Error('crf helper thread: one request at a time'));
      pending = { resolve: resolve as (reply: unknown) => void, reject };
      worker.postMessage(request);
    });
  let answered = 0;
  return {
    get answered() {
      return answered;
    },
    load: (shards) => ask<null>({ kind: 'load', shards }).then(() => undefined),
    evaluate: (weights) => ask<CrfShardValue[]>({ kind: 'evaluate', weights }).then((values) => (answered++, values)),
    end: async () => {
      fail(new Error('crf helper thread ended'));
      await worker.terminate();
    },
  };
}

/** Run `work` with `count` helper threads, ended after whatever happens. */
export async function crfWithHelpers<T>(count: number, work: (helpers: readonly CrfNodeHelper[]) => Promise<T>, moduleUrl?: URL): Promise<T> {
  const helpers = Array.from({ length: count }, () => crfNodeHelperStart(moduleUrl));
  try {
    return await work(helpers);
  } finally {
    await Promise.all(helpers.map((h) => h.end()));
  }
}
