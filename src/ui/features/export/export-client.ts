/** One export run in its own worker, ended when the run ends so no idle thread stays behind. */
import * as Comlink from 'comlink';
import type { ExportWorkerApi } from '../../../workers/export.worker';
import type { ExportOutcome, ExportProgress, ExportRequest } from '../../../workers/export-run';

export async function exportInWorker(request: ExportRequest, onProgress: (p: ExportProgress) => void): Promise<ExportOutcome> {
  const worker = new Worker(new URL('../../../workers/export.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<ExportWorkerApi>(worker);
  // A worker that fails to load or crashes never answers the call: turn its error event into a rejection.
  const crashed = new Promise<never>((_, reject) =>
    worker.addEventListener('error', (event) => reject(new Error(event.message || 'the export worker stopped unexpectedly')), { once: true }),
  );
  try {
    return await Promise.race([api.run(request, Comlink.proxy(onProgress)), crashed]);
  } finally {
    api[Comlink.releaseProxy]();
    worker.terminate();
  }
}
