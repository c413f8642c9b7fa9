import { describe, expect, it } from 'vitest';
import { JobCancelledError, workerJobStart, type WorkerLink } from '../../src/workers/worker-job';

interface FakeApi {
  run(onProgress: (n: number) => void): Promise<string>;
}

/** A worker stand-in: `run` is scripted by each test; `ended` counts terminate calls. */
function fakeLink(run: FakeApi['run']): WorkerLink<FakeApi> & { ended: number; crash: (message: string) => void } {
  let crash: (message: string) => void = () => {};
  const link = {
    api: { run },
    crashed: new Promise<never>((_, reject) => {
      crash = (message) => reject(new Error(message));
    }),
    ended: 0,
    end: () => {
      link.ended++;
    },
    crash: (message: string) => crash(message),
  };
  return link;
}

const macrotask = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

describe('workerJobStart', () => {
  it('drops progress that arrives after the result, as a message on another port may (HTML: ordering is per port only)', async () => {
    let late: ((n: number) => void) | undefined;
    const link = fakeLink(async (onProgress) => {
      onProgress(1);
      late = onProgress;
      return 'files';
    });
    const seen: number[] = [];
    const job = workerJobStart<FakeApi, number, string>(link, (api, onProgress) => api.run(onProgress), (n) => seen.push(n));
    // The page's screen state after the outcome: what a late "Writing 1200 of 1200" used to overwrite.
    let screen = 'running';
    const outcome = job.result.then((r) => {
      screen = `written ${r}`;
    });
    await outcome;
    late?.(1200);
    await macrotask();
    expect(screen).toBe('written files');
    expect(seen).toEqual([1]);
    expect(link.ended).toBe(1);
  });

  it('cancel ends the worker at once and rejects with JobCancelledError; the unanswered call is ignored', async () => {
    let finish: (value: string) => void = () => {};
    const link = fakeLink(() => new Promise<string>((resolve) => (finish = resolve)));
    const job = workerJobStart(link, (api, onProgress) => api.run(onProgress), undefined, 'The export');
    job.cancel();
    await expect(job.result).rejects.toBeInstanceOf(JobCancelledError);
    await expect(job.result).rejects.toThrow('The export was cancelled; nothing was kept.');
    finish('too late');
    job.cancel();
    await macrotask();
    expect(link.ended).toBe(1);
  });

  it('cancel after the result changes nothing', async () => {
    const link = fakeLink(async () => 'files');
    const job = workerJobStart(link, (api, onProgress) => api.run(onProgress));
    await expect(job.result).resolves.toBe('files');
    job.cancel();
    await expect(job.result).resolves.toBe('files');
    expect(link.ended).toBe(1);
  });

  it("a worker that crashes (its error event) rejects with the worker's message instead of hanging", async () => {
    const link = fakeLink(() => new Promise<string>(() => {}));
    const job = workerJobStart(link, (api, onProgress) => api.run(onProgress));
    link.crash('out of memory');
    await expect(job.result).rejects.toThrow('out of memory');
    expect(link.ended).toBe(1);
  });

  it('an error thrown by the call itself becomes the rejection', async () => {
    const link = fakeLink(async () => 'unused');
    const job = workerJobStart<FakeApi, number, string>(link, () => {
      throw new Error('could not clone the request');
    });
    await expect(job.result).rejects.toThrow('could not clone the request');
    expect(link.ended).toBe(1);
  });
});
