/** One export run in its own worker, ended when the run ends so no idle thread stays behind. */
import * as Comlink from 'comlink';
import type { ExportWorkerApi } from '../../../workers/export.worker';
import type { ExportOutcome, ExportProgress, ExportRequest } from '../../../workers/export-run';

export async function exportInWorker(request: ExportRequest, onProgress: (p: ExportProgress) => void): Promise<ExportOutcome> {
  const worker = new Worker(new URL('../../../workers/export.worker.ts', import.meta.url), { type: 'module' });
  const api = Comlink.wrap<ExportWorkerApi>(worker);
  try {
    return await api.run(request, Comlink.proxy(onProgress));
  } finally {
    api[Comlink.releaseProxy]();
    worker.terminate();
  }
}
