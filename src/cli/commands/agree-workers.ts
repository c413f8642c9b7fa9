import { availableParallelism, loadavg } from 'node:os';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { bootstrapRange, type BootstrapJob, type ResampleValues } from '../../core/agreement';
import type { LayerLoaded } from '../layer-load';
import type { LoadOptions } from '../load';
import { layerLoad } from '../layer-load';
import { agreeJobAssemble, agreeJobBuffers, agreeJobRun, agreeJobsPlan, agreeTailsTake, agreeWordsCreate, type AgreeJob, type AgreeJobResult } from './agree-jobs';

/**
 * Helper threads for `agree`: each parses files into alignment data (the main thread may take the
 * tail of one, see `agree-jobs`), then runs a range of bootstrap resamples, while the main thread
 * does its own share of both. The parts join into exactly the one-thread layers and the bootstrap
 * ranges into exactly the one-thread values (see `bootstrapRange`), so the figures do not depend
 * on the thread count.
 * The worker runs this same module file (the CLI bundle), recognised by its `workerData` marker.
 */
const WORKER_MARK = 'slotsmith-agree-worker';

export type GatherReply = LayerLoaded;

type Request =
  | { kind: 'gather'; job: AgreeJob; words: BigInt64Array }
  | { kind: 'bootstrap'; job: BootstrapJob; from: number; to: number };

if (!isMainThread && (workerData as { mark?: string } | null)?.mark === WORKER_MARK) {
  parentPort?.on('message', (request: Request) => {
    if (request.kind === 'gather') {
      const result = agreeJobRun(request.job, request.words);
      parentPort?.postMessage(result, agreeJobBuffers(result));
    } else {
      const { job, from, to } = request;
      const values = bootstrapRange(job.rows, job.layout, job.seed, from, to);
      parentPort?.postMessage(values, Object.values(values).map((a) => a.buffer as ArrayBuffer));
    }
  });
}

/** Below this much input, starting threads (~50 ms each) costs more than it saves. */
export const AGREE_THREADS_FROM_BYTES = 8 << 20;

/**
 * Helper threads to start beside the main thread, which takes its own share of the work:
 * `asked` (SLOTSMITH_WORKERS) when set (0 = none, capped at twice the CPUs); otherwise one fewer
 * than the CPUs (at most 3) once the input reaches AGREE_THREADS_FROM_BYTES, unless the 1-minute
 * `load` average is already at the CPU count: with no core free, a helper only adds its start-up
 * and hand-over (about a third more CPU time, measured on two cores at load 5). The files then
 * parse side by side and the bootstrap resamples split between the threads; the figures do not
 * depend on it.
 */
export function agreeThreadsChoose(asked: string | undefined, cpus: number, inputBytes: number, load = 0): number {
  if (asked !== undefined && asked !== '') return /^\d+$/.test(asked) ? Math.min(Number(asked), cpus * 2) : 0;
  return cpus >= 2 && inputBytes >= AGREE_THREADS_FROM_BYTES && load < cpus ? Math.min(cpus, 4) - 1 : 0;
}

/** `agreeThreadsChoose` for this process; none when running from TypeScript sources (a worker could not load the file). */
export function agreeWorkerCount(inputBytes: number): number {
  if (!/\.m?js$/.test(new URL(import.meta.url).pathname)) return 0;
  return agreeThreadsChoose(process.env.SLOTSMITH_WORKERS, availableParallelism(), inputBytes, loadavg()[0] ?? 0);
}

export class AgreeWorkers {
  private readonly workers: Worker[];

  constructor(count: number) {
    this.workers = Array.from({ length: count }, () => new Worker(new URL(import.meta.url), { workerData: { mark: WORKER_MARK } }));
  }

  private ask<T>(worker: Worker, request: Request): Promise<T> {
    return this.askAll<T>(worker, [request]).then((replies) => replies[0] as T);
  }

  /** Post all `requests` at once; the worker answers them in turn, so replies come in request order. */
  private askAll<T>(worker: Worker, requests: readonly Request[]): Promise<T[]> {
    if (requests.length === 0) return Promise.resolve([]);
    return new Promise<T[]>((resolve, reject) => {
      const replies: T[] = [];
      const onError = (error: Error): void => {
        worker.off('message', onMessage);
        reject(error);
      };
      const onMessage = (reply: T): void => {
        replies.push(reply);
        if (replies.length < requests.length) return;
        worker.off('message', onMessage);
        worker.off('error', onError);
        resolve(replies);
      };
      worker.on('message', onMessage);
      worker.once('error', onError);
      for (const request of requests) worker.postMessage(request);
    });
  }

  /**
   * Parse the files in parallel, replies in file order: with n helpers, file i goes to helper
   * i mod (n + 1), or is parsed here when that is n. All the helpers' requests are posted before
   * this thread starts on its own files; then it takes tails of the helpers' files while they are
   * worth it (see `agreeTailsTake`).
   */
  async gather(files: readonly string[], options: LoadOptions, sizes: readonly number[]): Promise<GatherReply[]> {
    const lanes = this.workers.length + 1;
    const jobs = agreeJobsPlan(files, sizes, options);
    const words = agreeWordsCreate(jobs);
    const results: AgreeJobResult[] = new Array<AgreeJobResult>(files.length);
    const helperFiles: number[] = [];
    const helping = this.workers.map(async (worker, w) => {
      const mine: number[] = [];
      for (let i = w; i < files.length; i += lanes) mine.push(i);
      helperFiles.push(...mine);
      const replies = await this.askAll<AgreeJobResult>(worker, mine.map((i): Request => ({ kind: 'gather', job: jobs[i] as AgreeJob, words })));
      replies.forEach((reply, r) => {
        results[mine[r] as number] = reply;
      });
    });
    helperFiles.sort((a, b) => a - b);
    const replies: GatherReply[] = new Array<GatherReply>(files.length);
    for (let i = this.workers.length; i < files.length; i += lanes) replies[i] = layerLoad(files[i] ?? '', options, sizes[i] ?? 0);
    const tails = agreeTailsTake(jobs, helperFiles, words);
    await Promise.all(helping);
    for (const i of helperFiles) replies[i] = agreeJobAssemble(jobs[i] as AgreeJob, results[i] as AgreeJobResult, tails, options);
    return replies;
  }

  /** All resamples of the job in one contiguous range per thread (this one takes the last), in resample order. */
  async bootstrap(job: BootstrapJob): Promise<ResampleValues[]> {
    const lanes = this.workers.length + 1;
    const range = (w: number) => [Math.floor((job.resamples * w) / lanes), Math.floor((job.resamples * (w + 1)) / lanes)] as const;
    const helping = this.workers.map((worker, w) => {
      const [from, to] = range(w);
      return this.ask<ResampleValues>(worker, { kind: 'bootstrap', job, from, to });
    });
    const [from, to] = range(this.workers.length);
    const mine = bootstrapRange(job.rows, job.layout, job.seed, from, to);
    return [...(await Promise.all(helping)), mine];
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }
}
