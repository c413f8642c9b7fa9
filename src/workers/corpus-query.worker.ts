/** The utterance table's worker: builds and keeps the project index off the page's thread and heap. */
import * as Comlink from 'comlink';
import { dbOpen } from '../db';
import { corpusIndexStoreOpen, type CorpusIndexStore } from '../db/corpus-index-store';
import { CorpusService, type CorpusAnswer } from '../db/corpus-service';
import type { CorpusQuery } from '../db/corpus-query';

/** When this worker's steps towards a page's first rows happened (epoch ms), for the page's marks (the table bench reads them). */
const steps: [string, number][] = [];
const stamp = (step: string) => steps.push([step, performance.timeOrigin + performance.now()]);
stamp('start');
const store = corpusIndexStoreOpen(indexedDB);
const timed: CorpusIndexStore = {
  ...store,
  async load(projectId) {
    stamp('load');
    const index = await store.load(projectId);
    stamp('loaded');
    return index;
  },
};
const service = new CorpusService(dbOpen(), timed);

const api = {
  async query(projectId: number, query: CorpusQuery, onProgress?: (done: number, total: number) => void): Promise<CorpusAnswer> {
    // Progress calls go back over the message port; not awaited, so reading never waits on the page.
    const answer = await service.query(projectId, query, onProgress === undefined ? undefined : (done, total) => void onProgress(done, total));
    // The id list moves to the page without a copy.
    return Comlink.transfer(answer, [answer.ids.buffer]);
  },
  /** Load the project's saved index ahead of the first question (see CorpusService.warm). */
  async warm(projectId: number): Promise<CorpusAnswer['index'] | null> {
    stamp('warm');
    const how = await service.warm(projectId);
    stamp('warmed');
    return how;
  },
  /** The steps stamped since the last call. */
  steps(): [string, number][] {
    return steps.splice(0);
  },
  /** As `query`, but null instead of building an index (see CorpusService.queryIfIndexed). */
  async queryIfIndexed(projectId: number, query: CorpusQuery): Promise<CorpusAnswer | null> {
    const answer = await service.queryIfIndexed(projectId, query);
    return answer === null ? null : Comlink.transfer(answer, [answer.ids.buffer]);
  },
};

export type CorpusWorkerApi = typeof api;

Comlink.expose(api);
