/** The page's side of the import worker: one worker per tab, started on first use. */
import * as Comlink from 'comlink';
import Papa from 'papaparse';
import { formatDetect, type FormatName } from '../../../core/formats';
import type { ImportWorkerApi } from '../../../workers/import.worker';

let worker: Comlink.Remote<ImportWorkerApi> | undefined;

export function importWorker(): Comlink.Remote<ImportWorkerApi> {
  worker ??= Comlink.wrap<ImportWorkerApi>(new Worker(new URL('../../../workers/import.worker.ts', import.meta.url), { type: 'module' }));
  return worker;
}

let jobCounter = 0;

export function importJobId(): string {
  jobCounter += 1;
  return `job-${Date.now()}-${jobCounter}`;
}

// Enough of the head for format detection (50 lines) and a CSV header line.
const HEAD_BYTES = 64 * 1024;

export interface FileHead {
  detected: FormatName;
  /** Header names of the first record, for CSV/TSV. */
  columns: string[];
}

export function headerColumns(head: string, format: FormatName): string[] {
  if (format !== 'csv' && format !== 'tsv') return [];
  const firstLine = head.replace(/^\uFEFF/, '').split(/\r?\n/, 1)[0] ?? '';
  const parsed = Papa.parse<string[]>(firstLine, { delimiter: format === 'csv' ? ',' : '\t' });
  return (parsed.data[0] ?? []).filter((name) => name !== '');
}

export async function fileHeadRead(file: File): Promise<{ head: string; detected: FormatName }> {
  const head = await file.slice(0, HEAD_BYTES).text();
  return { head, detected: formatDetect(file.name, head) };
}
