/** The import worker: preview and commit off the page's thread, over the worker's own database connection. */
import * as Comlink from 'comlink';
import { dbOpen } from '../db';
import { corpusIndexStoreOpen } from '../db/corpus-index-store';
import { layerCopyStoreOpen } from '../db/layer-copy-store';
import type { ImportPreview } from './import-preview';
import { importCommit, importPreview, type CommitRequest, type ImportProgress, type ImportRequest, type ImportSummary } from './import-run';

const db = dbOpen();
// The table's index made during an import into an empty project goes here, for the table's worker to find.
const indexStore = corpusIndexStoreOpen(indexedDB);
// Layer copies made or signed again by an import go here, for the agreement dashboard's worker to find.
const copyStore = layerCopyStoreOpen(indexedDB);
const cancelledJobs = new Set<string>();

function control(jobId: string, onProgress: ((p: ImportProgress) => void) | undefined) {
  return {
    cancelled: () => cancelledJobs.has(jobId),
    // Progress calls go back over the message port; not awaited, so reading never waits on the page.
    onProgress: (p: ImportProgress) => void onProgress?.(p),
    lock: <T>(name: string, work: () => Promise<T>): Promise<T> => navigator.locks.request(name, work),
    indexStore,
    copyStore,
  };
}

const api = {
  async preview(file: Blob, request: ImportRequest, jobId: string, onProgress?: (p: ImportProgress) => void): Promise<ImportPreview> {
    try {
      return await importPreview(db, file, request, control(jobId, onProgress));
    } finally {
      cancelledJobs.delete(jobId);
    }
  },
  async commit(file: Blob, request: CommitRequest, jobId: string, onProgress?: (p: ImportProgress) => void): Promise<ImportSummary> {
    try {
      return await importCommit(db, file, request, control(jobId, onProgress));
    } finally {
      cancelledJobs.delete(jobId);
    }
  },
  /** Takes effect between two chunks of the file; a cancelled commit is rolled back before it returns. */
  cancel(jobId: string): void {
    cancelledJobs.add(jobId);
  },
};

export type ImportWorkerApi = typeof api;

Comlink.expose(api);
