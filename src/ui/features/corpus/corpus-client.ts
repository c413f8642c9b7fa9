/** The page's side of the utterance table's worker: one per tab, started on first use. */
import * as Comlink from 'comlink';
import type { CorpusWorkerApi } from '../../../workers/corpus-query.worker';

let worker: Comlink.Remote<CorpusWorkerApi> | undefined;

export function corpusWorker(): Comlink.Remote<CorpusWorkerApi> {
  worker ??= Comlink.wrap<CorpusWorkerApi>(new Worker(new URL('../../../workers/corpus-query.worker.ts', import.meta.url), { type: 'module' }));
  return worker;
}

/** A Performance API mark of a step towards the first rows (the table bench reads them; `slotsmith-corpus:` names). */
export function corpusMark(step: string, startTime?: number): void {
  performance.mark(`slotsmith-corpus:${step}`, startTime === undefined ? undefined : { startTime });
}
