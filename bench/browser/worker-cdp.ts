/**
 * DevTools protocol sessions on a page's dedicated workers. Playwright opens CDP sessions on pages
 * only, so this asks the page's session to auto-attach to its workers (Target.setAutoAttach,
 * non-flat) and talks to each through Target.sendMessageToTarget / receivedMessageFromTarget.
 */
import type { CDPSession, Page } from '@playwright/test';

interface Attached {
  sessionId: string;
  url: string;
}

export interface WorkerCdp {
  /** Workers attached so far (URL as loaded, e.g. …/import.worker-abc.js). */
  workers(): Attached[];
  /** Send a protocol method to the first attached worker whose URL contains `urlPart`. */
  send<T = unknown>(urlPart: string, method: string, params?: Record<string, unknown>): Promise<T>;
  detach(): Promise<void>;
}

export async function workerCdp(page: Page): Promise<WorkerCdp> {
  const cdp: CDPSession = await page.context().newCDPSession(page);
  const attached = new Map<string, Attached>();
  const waiting = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  let nextId = 1;
  cdp.on('Target.attachedToTarget', (event) => {
    if (event.targetInfo.type === 'worker') attached.set(event.sessionId, { sessionId: event.sessionId, url: event.targetInfo.url });
  });
  cdp.on('Target.detachedFromTarget', (event) => {
    attached.delete(event.sessionId);
  });
  cdp.on('Target.receivedMessageFromTarget', (event) => {
    const message = JSON.parse(event.message) as { id?: number; result?: unknown; error?: { message: string } };
    if (message.id === undefined) return;
    const w = waiting.get(message.id);
    if (w === undefined) return;
    waiting.delete(message.id);
    if (message.error !== undefined) w.reject(new Error(message.error.message));
    else w.resolve(message.result);
  });
  await cdp.send('Target.setAutoAttach', { autoAttach: true, waitForDebuggerOnStart: false, flatten: false });
  return {
    workers: () => [...attached.values()],
    async send<T>(urlPart: string, method: string, params: Record<string, unknown> = {}): Promise<T> {
      const target = [...attached.values()].find((w) => w.url.includes(urlPart));
      if (target === undefined) throw new Error(`no worker attached whose URL contains ${JSON.stringify(urlPart)} (have: ${[...attached.values()].map((w) => w.url).join(', ') || 'none'})`);
      const id = nextId++;
      const answer = new Promise<T>((resolve, reject) => waiting.set(id, { resolve: resolve as (v: unknown) => void, reject }));
      await cdp.send('Target.sendMessageToTarget', { sessionId: target.sessionId, message: JSON.stringify({ id, method, params }) });
      return answer;
    },
    detach: () => cdp.detach(),
  };
}

export interface WorkerHeap {
  usedMb: number;
  totalMb: number;
}

const mb = (bytes: number) => bytes / (1024 * 1024);

/** A worker's JS heap (Runtime.getHeapUsage), optionally after a forced collection (HeapProfiler.collectGarbage). */
export async function workerHeap(cdp: WorkerCdp, urlPart: string, collect: boolean): Promise<WorkerHeap> {
  if (collect) {
    await cdp.send(urlPart, 'HeapProfiler.enable');
    await cdp.send(urlPart, 'HeapProfiler.collectGarbage');
  }
  const usage = await cdp.send<{ usedSize: number; totalSize: number }>(urlPart, 'Runtime.getHeapUsage');
  return { usedMb: mb(usage.usedSize), totalMb: mb(usage.totalSize) };
}

/** Samples a worker's used heap every `everyMs` while it exists; `stop` gives the highest sample. */
export function workerHeapPeak(cdp: WorkerCdp, urlPart: string, everyMs = 250): { stop: () => Promise<number> } {
  let peak = 0;
  let busy: Promise<void> = Promise.resolve();
  const timer = setInterval(() => {
    busy = busy.then(async () => {
      if (!cdp.workers().some((w) => w.url.includes(urlPart))) return;
      try {
        peak = Math.max(peak, (await workerHeap(cdp, urlPart, false)).usedMb);
      } catch {
        // The worker ended between the check and the call.
      }
    });
  }, everyMs);
  return {
    stop: async () => {
      clearInterval(timer);
      await busy;
      return peak;
    },
  };
}
