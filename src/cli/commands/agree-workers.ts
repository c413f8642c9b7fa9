import { availableParallelism } from 'node:os';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { AlignLayerGatherer, bootstrapRange, type AlignLayerData, type BootstrapJob, type ResampleValues } from '../../core/agreement';
import type { ReadError } from '../../core/types';
import { documentLoad, type LoadOptions } from '../load';

/**
 * Helper threads for `agree`: each parses files into alignment data, then runs a range of
 * bootstrap resamples, while the main thread does its own share of both. Both are pure core functions; the bootstrap ranges join into exactly the
 * one-thread values (see `bootstrapRange`), so the figures do not depend on the thread count.
 * The worker runs this same module file (the CLI bundle), recognised by its `workerData` marker.
 */
const WORKER_MARK = 'slotsmith-agree-worker';

export type GatherReply =
  | { ok: true; layer: AlignLayerData; errors: ReadError[] }
  | { ok: false; message: string };

type Request =
  | { kind: 'gather'; file: string; options: LoadOptions }
  | { kind: 'bootstrap'; job: BootstrapJob; from: number; to: number };

function gather(file: string, options: LoadOptions): GatherReply {
  const gatherer = new AlignLayerGatherer(file);
  const loaded = documentLoad(file, options, (utterance) => gatherer.utteranceAdd(utterance));
  if (!loaded.ok) return { ok: false, message: loaded.message };
  return { ok: true, layer: gatherer.done(), errors: loaded.document.errors };
}

function layerBuffers(layer: AlignLayerData): ArrayBuffer[] {
  return [layer.lines, layer.tokenStart, layer.ranges, layer.tokenLines, layer.tagCounts, layer.tags, layer.intents].map((a) => a.buffer as ArrayBuffer);
}

if (!isMainThread && (workerData as { mark?: string } | null)?.mark === WORKER_MARK) {
  parentPort?.on('message', (request: Request) => {
    if (request.kind === 'gather') {
      const reply = gather(request.file, request.options);
      parentPort?.postMessage(reply, reply.ok ? layerBuffers(reply.layer) : []);
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
 * than the CPUs (at most 3) once the input reaches AGREE_THREADS_FROM_BYTES. The files then parse
 * side by side and the bootstrap resamples split between the threads; the figures do not depend on it.
 */
export function agreeThreadsChoose(asked: string | undefined, cpus: number, inputBytes: number): number {
  if (asked !== undefined && asked !== '') return /^\d+$/.test(asked) ? Math.min(Number(asked), cpus * 2) : 0;
  return cpus >= 2 && inputBytes >= AGREE_THREADS_FROM_BYTES ? Math.min(cpus, 4) - 1 : 0;
}

/** `agreeThreadsChoose` for this process; none when running from TypeScript sources (a worker could not load the file). */
export function agreeWorkerCount(inputBytes: number): number {
  if (!/\.m?js$/.test(new URL(import.meta.url).pathname)) return 0;
  return agreeThreadsChoose(process.env.SLOTSMITH_WORKERS, availableParallelism(), inputBytes);
}

export class AgreeWorkers {
  private readonly workers: Worker[];

  constructor(count: number) {
    this.workers = Array.from({ length: count }, () => new Worker(new URL(import.meta.url), { workerData: { mark: WORKER_MARK } }));
  }

  private ask<T>(worker: Worker, request: Request): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      const onError = (error: Error): void => {
        worker.off('message', onMessage);
        reject(error);
      };
      const onMessage = (reply: T): void => {
        worker.off('error', onError);
        resolve(reply);
      };
      worker.once('message', onMessage);
      worker.once('error', onError);
      worker.postMessage(request);
    });
  }

  /**
   * Parse the files in parallel, replies in file order: with n helpers, file i goes to helper
   * i mod (n + 1), or is parsed here when that is n. The helpers' requests are posted before this
   * thread starts on its own files, and its share needs no copying between threads.
   */
  async gather(files: readonly string[], options: LoadOptions): Promise<GatherReply[]> {
    const lanes = this.workers.length + 1;
    const replies: GatherReply[] = new Array<GatherReply>(files.length);
    const helping = this.workers.map(async (worker, w) => {
      for (let i = w; i < files.length; i += lanes) {
        replies[i] = await this.ask<GatherReply>(worker, { kind: 'gather', file: files[i] ?? '', options });
      }
    });
    for (let i = this.workers.length; i < files.length; i += lanes) replies[i] = gather(files[i] ?? '', options);
    await Promise.all(helping);
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
